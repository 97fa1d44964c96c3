// Bundles the command line (server/cli/tuckline.ts) into dist/cli/: platform
// node, ESM, every package inlined, minified (less to parse at each start).
// Code splitting puts what only `stamp` and `report` use (the schema library,
// the exporters, the meters) in chunks loaded on demand, so `detect` parses
// little more than the detector. The banner gives CommonJS dependencies
// (wav-decoder) the `require` they expect inside an ES module.
import { mkdirSync, readdirSync, renameSync, rmSync, writeFileSync } from 'node:fs';
import { basename, dirname, join, resolve } from 'node:path';
import { fileURLToPath, pathToFileURL } from 'node:url';

export const root = resolve(dirname(fileURLToPath(import.meta.url)), '..');
export const outDir = join(root, 'dist/cli');
export const bundlePath = join(outDir, 'tuckline.mjs');
const chunkDir = join(outDir, 'chunks');

export async function buildCli({ quiet = false } = {}) {
  const { build } = await import('esbuild');
  const result = await build({
    absWorkingDir: root,
    entryPoints: ['server/cli/tuckline.ts'],
    bundle: true,
    splitting: true,
    minify: true,
    platform: 'node',
    format: 'esm',
    target: 'node20',
    write: false,
    outdir: outDir,
    entryNames: '[name]',
    chunkNames: 'chunks/[name]-[hash]',
    outExtension: { '.js': '.mjs' },
    logLevel: quiet ? 'error' : 'info',
    banner: { js: "import { createRequire as __tucklineCreateRequire } from 'node:module'; const require = __tucklineCreateRequire(import.meta.url);" },
  });
  mkdirSync(chunkDir, { recursive: true });
  // Chunks first (their names carry a content hash, so a running CLI keeps
  // its own), the entry last and by rename, so a CLI started meanwhile never
  // imports half a file or a chunk that is not there yet.
  const entry = result.outputFiles.find((f) => f.path === bundlePath);
  const chunks = result.outputFiles.filter((f) => f !== entry);
  for (const chunk of chunks) writeFileSync(chunk.path, chunk.contents);
  const tmp = `${bundlePath}.${process.pid}.tmp`;
  writeFileSync(tmp, entry.contents);
  renameSync(tmp, bundlePath);
  const keep = new Set(chunks.map((c) => basename(c.path)));
  for (const name of readdirSync(chunkDir)) if (!keep.has(name)) rmSync(join(chunkDir, name), { force: true });
  if (!quiet) console.log(`built ${bundlePath} and ${chunks.length} chunks`);
}

if (process.argv[1] && import.meta.url === pathToFileURL(process.argv[1]).href) {
  await buildCli();
}
