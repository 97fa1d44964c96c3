// Files read as text through `import x from './file' with { loader: 'text' }` (Angular's esbuild loader).
declare module '*.scss' {
  const text: string;
  export default text;
}
