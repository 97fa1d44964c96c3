// `npm start`: builds what is stale, then runs the server with the demo data.
// PostgreSQL is started (and stopped on exit) by the server itself.
import { spawn } from 'node:child_process';
import { join } from 'node:path';
import { ensurePackages, needs } from './system-packages.mjs';
import { buildWeb } from './web-build.mjs';

const root = new URL('..', import.meta.url).pathname;
try {
  if (!process.env.DATABASE_URL) ensurePackages(needs.start);
  buildWeb();
} catch (error) {
  process.stderr.write(`[tuckline] ${error.message}\n`);
  process.exit(1);
}

const server = spawn(process.execPath, ['--import', 'tsx', join(root, 'server/main.ts'), '--seed', ...process.argv.slice(2)], {
  cwd: root,
  stdio: 'inherit',
});
for (const signal of ['SIGINT', 'SIGTERM']) process.on(signal, () => server.kill(signal));
server.on('exit', (code, signal) => process.exit(code ?? (signal ? 1 : 0)));
