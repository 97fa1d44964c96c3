// `npm test`: every suite, in order, with one closing line. Exits non-zero on any failure.
import { spawnSync } from 'node:child_process';
import { existsSync, mkdtempSync, readFileSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { ensurePackages, needs } from './system-packages.mjs';
import { buildWeb } from './web-build.mjs';

const root = new URL('..', import.meta.url).pathname;
const say = (line) => process.stdout.write(`[tuckline test] ${line}\n`);
const reports = mkdtempSync(join(tmpdir(), 'tuckline-test-report-'));
const env = { ...process.env, NG_CLI_ANALYTICS: 'false', FORCE_COLOR: process.env.FORCE_COLOR ?? '0' };
const totals = { passed: 0, failed: 0, skipped: 0 };
const failures = [];

function step(name, fn) {
  say(`— ${name}`);
  const started = Date.now();
  try {
    const ok = fn();
    if (ok === false) failures.push(name);
  } catch (error) {
    process.stderr.write(`${error.message}\n`);
    failures.push(name);
  }
  say(`  ${name}: ${((Date.now() - started) / 1000).toFixed(1)} s`);
}

function vitest(name, projects) {
  const out = join(reports, `${name}.json`);
  const args = [join(root, 'node_modules/vitest/vitest.mjs'), 'run', ...projects.flatMap((p) => ['--project', p]), '--reporter=default', '--reporter=json', `--outputFile.json=${out}`];
  const result = spawnSync(process.execPath, args, { cwd: root, stdio: 'inherit', env });
  if (existsSync(out)) {
    const report = JSON.parse(readFileSync(out, 'utf8'));
    totals.passed += report.numPassedTests;
    totals.failed += report.numFailedTests;
    totals.skipped += report.numPendingTests + report.numTodoTests;
  } else if (result.status !== 0) {
    totals.failed += 1;
  }
  return result.status === 0;
}

function ngTest() {
  const result = spawnSync(process.execPath, [join(root, 'node_modules/@angular/cli/bin/ng.js'), 'test', '--watch=false'], { cwd: root, env, encoding: 'utf8', stdio: ['ignore', 'pipe', 'pipe'] });
  process.stdout.write(result.stdout);
  process.stderr.write(result.stderr);
  // Vitest's summary line, e.g. "Tests  12 passed | 1 failed (13)".
  const line = (result.stdout + result.stderr).replace(/\x1b\[[0-9;]*m/g, '').match(/^\s*Tests\s+(.*)$/m)?.[1] ?? '';
  const count = (word) => Number(new RegExp(`(\\d+) ${word}`).exec(line)?.[1] ?? 0);
  totals.passed += count('passed');
  totals.failed += count('failed') || (result.status === 0 ? 0 : 1);
  totals.skipped += count('skipped');
  return result.status === 0;
}

step('system packages', () => ensurePackages(needs.test));
step('type check (server, pure shared/, browser tests)', () => {
  const tsc = join(root, 'node_modules/typescript/bin/tsc');
  return ['tsconfig.server.json', 'shared/tsconfig.json', 'test/e2e/tsconfig.json'].every(
    (project) => spawnSync(process.execPath, [tsc, '-p', project, '--noEmit'], { cwd: root, stdio: 'inherit', env }).status === 0,
  );
});
step('web build', () => buildWeb());
step('shared, server, reference and API tests (vitest)', () => vitest('node', ['unit', 'reference', 'api']));
step('Angular component tests (ng test)', () => ngTest());
step('browser tests (playwright-core + Debian chromium)', () => vitest('e2e', ['e2e']));

rmSync(reports, { recursive: true, force: true });
if (failures.length) say(`failed steps: ${failures.join(', ')}`);
process.stdout.write(`\n${totals.passed} passed, ${totals.failed} failed${totals.skipped ? `, ${totals.skipped} skipped` : ''}\n`);
process.exit(failures.length ? 1 : 0);
