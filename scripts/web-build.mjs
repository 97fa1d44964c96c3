// Builds the Angular client when dist/ is missing or older than its sources.
import { spawnSync } from 'node:child_process';
import { existsSync, readdirSync, statSync } from 'node:fs';
import { join } from 'node:path';

const root = new URL('..', import.meta.url).pathname;
const index = join(root, 'dist/web/browser/index.html');

function newestMtime(dir) {
  let newest = 0;
  for (const entry of readdirSync(dir, { withFileTypes: true })) {
    if (entry.name === 'node_modules' || entry.name.startsWith('.')) continue;
    const path = join(dir, entry.name);
    newest = Math.max(newest, entry.isDirectory() ? newestMtime(path) : statSync(path).mtimeMs);
  }
  return newest;
}

export function webBuildIsStale() {
  if (!existsSync(index)) return true;
  const sources = Math.max(newestMtime(join(root, 'src')), newestMtime(join(root, 'shared')), statSync(join(root, 'angular.json')).mtimeMs);
  return sources > statSync(index).mtimeMs;
}

export function buildWeb({ force = false } = {}) {
  if (!force && !webBuildIsStale()) return;
  process.stdout.write('[tuckline] Building the web client (ng build)…\n');
  const result = spawnSync(process.execPath, [join(root, 'node_modules/@angular/cli/bin/ng.js'), 'build'], {
    cwd: root,
    stdio: 'inherit',
    env: { ...process.env, NG_CLI_ANALYTICS: 'false' },
  });
  if (result.status !== 0) throw new Error('ng build failed.');
}
