// Bundles the command line (server/cli/tuckline.ts) into dist/cli/tuckline.mjs:
// platform node, ESM, every package inlined; the banner gives CommonJS
// dependencies (wav-decoder) the `require` they expect inside an ES module.
import { mkdirSync, renameSync, writeFileSync } from 'node:fs';
import { dirname, join, resolve } from 'node:path';
import { fileURLToPath, pathToFileURL } from 'node:url';

export const root = resolve(dirname(fileURLToPath(import.meta.url)), '..');
export const bundlePath = join(root, 'dist/cli/tuckline.mjs');

export async function buildCli({ quiet = false } = {}) {
  const { build } = await import('esbuild');
  const result = await build({
    absWorkingDir: root,
    entryPoints: ['server/cli/tuckline.ts'],
    bundle: true,
    platform: 'node',
    format: 'esm',
    target: 'node20',
    write: false,
    outfile: bundlePath,
    logLevel: quiet ? 'error' : 'info',
    banner: { js: "import { createRequire as __tucklineCreateRequire } from 'node:module'; const require = __tucklineCreateRequire(import.meta.url);" },
  });
  mkdirSync(dirname(bundlePath), { recursive: true });
  // Write then rename, so a CLI started meanwhile never imports half a file.
  const tmp = `${bundlePath}.${process.pid}.tmp`;
  writeFileSync(tmp, result.outputFiles[0].contents);
  renameSync(tmp, bundlePath);
  if (!quiet) console.log(`built ${bundlePath}`);
}

if (process.argv[1] && import.meta.url === pathToFileURL(process.argv[1]).href) {
  await buildCli();
}
