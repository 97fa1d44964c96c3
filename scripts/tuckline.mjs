// Launcher of the command line: rebuilds dist/cli/ (tuckline.mjs and its
// chunks) quietly when it is missing or older than any source it bundles,
// then runs it. Plain node on the bundle starts in about 0.05 s; the
// staleness check is a few stat calls.
import { readdirSync, statSync } from 'node:fs';
import { dirname, join, resolve } from 'node:path';
import { fileURLToPath, pathToFileURL } from 'node:url';

const root = resolve(dirname(fileURLToPath(import.meta.url)), '..');
const bundle = join(root, 'dist/cli/tuckline.mjs');
const SOURCES = ['shared', 'server/audio', 'server/engine', 'server/cli'];

function newestMtime(dir) {
  let newest = 0;
  let entries;
  try {
    entries = readdirSync(dir, { withFileTypes: true });
  } catch {
    return 0;
  }
  for (const e of entries) {
    const p = join(dir, e.name);
    if (e.isDirectory()) newest = Math.max(newest, newestMtime(p));
    else if (e.name.endsWith('.ts') || e.name.endsWith('.json')) newest = Math.max(newest, statSync(p).mtimeMs);
  }
  return newest;
}

let stale = true;
try {
  const built = statSync(bundle).mtimeMs;
  stale = SOURCES.some((d) => newestMtime(join(root, d)) > built);
} catch {
  stale = true;
}
async function build() {
  try {
    const { buildCli } = await import('./build-cli.mjs');
    await buildCli({ quiet: true });
  } catch (e) {
    process.stderr.write(`tuckline: could not build the command line: ${String(e?.message ?? e).split('\n')[0]}\n`);
    process.exit(1);
  }
}
if (stale) await build();
let cli;
try {
  cli = await import(pathToFileURL(bundle).href);
} catch (e) {
  // A chunk of the bundle went missing (dist/ half cleaned): build again once.
  if (e?.code !== 'ERR_MODULE_NOT_FOUND') throw e;
  await build();
  cli = await import(`${pathToFileURL(bundle).href}?rebuilt`);
}
process.exitCode = await cli.main(process.argv.slice(2));
