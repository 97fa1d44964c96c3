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
  // Every file is written under a temporary name and renamed into place, so
  // a CLI started meanwhile (or another build running at the same time, as
  // when several commands start on a fresh clone) never reads half a file.
  // Chunks first (their names carry a content hash, so a running CLI keeps
  // its own), the entry last, so it never points at a chunk not there yet.
  const entry = result.outputFiles.find((f) => f.path === bundlePath);
  const chunks = result.outputFiles.filter((f) => f !== entry);
  const place = (path, contents) => {
    const tmp = `${path}.${process.pid}.tmp`;
    writeFileSync(tmp, contents);
    renameSync(tmp, path);
  };
  for (const chunk of chunks) place(chunk.path, chunk.contents);
  place(bundlePath, entry.contents);
  const keep = new Set(chunks.map((c) => basename(c.path)));
  // Old chunks go; another build's temporary files are left to it.
  for (const name of readdirSync(chunkDir)) if (!keep.has(name) && !name.endsWith('.tmp')) rmSync(join(chunkDir, name), { force: true });
  if (!quiet) console.log(`built ${bundlePath} and ${chunks.length} chunks`);
}

if (process.argv[1] && import.meta.url === pathToFileURL(process.argv[1]).href) {
  await buildCli();
}
