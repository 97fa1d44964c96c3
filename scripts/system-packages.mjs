// Debian packages the product and its tests need, installed with apt-get when
// missing and running as root; otherwise a clear message naming the command.
import { spawnSync } from 'node:child_process';
import { existsSync, readdirSync } from 'node:fs';

const checks = {
  postgresql: () => existsSync('/usr/lib/postgresql') && readdirSync('/usr/lib/postgresql').some((v) => existsSync(`/usr/lib/postgresql/${v}/bin/initdb`)),
  chromium: () => existsSync('/usr/bin/chromium'),
  ffmpeg: () => existsSync('/usr/bin/ffmpeg'),
  sox: () => existsSync('/usr/bin/sox'),
  'aubio-tools': () => existsSync('/usr/bin/aubioonset'),
  'python3-mido': () => spawnSync('/usr/bin/python3', ['-c', 'import mido'], { stdio: 'ignore' }).status === 0,
  midicsv: () => existsSync('/usr/bin/midicsv'),
  time: () => existsSync('/usr/bin/time'),
};

/** Which packages each command needs. */
export const needs = {
  start: ['postgresql'],
  test: Object.keys(checks),
};

export function ensurePackages(names, log = (line) => process.stdout.write(line + '\n')) {
  const missing = names.filter((name) => !checks[name]());
  if (!missing.length) return;
  const command = `apt-get update && apt-get install -y --no-install-recommends ${missing.join(' ')}`;
  if (process.getuid?.() !== 0) {
    throw new Error(`Missing Debian packages: ${missing.join(', ')}. Install them with:\n  sudo ${command}`);
  }
  log(`[tuckline] Installing Debian packages: ${missing.join(', ')}…`);
  const env = { ...process.env, DEBIAN_FRONTEND: 'noninteractive' };
  const run = (args) => spawnSync('apt-get', args, { stdio: ['ignore', 'inherit', 'inherit'], env }).status;
  if (run(['install', '-y', '--no-install-recommends', ...missing]) !== 0) {
    run(['update']);
    if (run(['install', '-y', '--no-install-recommends', ...missing]) !== 0) throw new Error(`apt-get failed. Run:\n  ${command}`);
  }
  const still = missing.filter((name) => !checks[name]());
  if (still.length) throw new Error(`Still missing after apt-get: ${still.join(', ')}. Run:\n  ${command}`);
}
