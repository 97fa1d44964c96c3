import { execFileSync, spawnSync } from 'node:child_process';
import { createHash } from 'node:crypto';
import { chownSync, existsSync, mkdirSync, readdirSync, readFileSync, rmSync } from 'node:fs';
import { createServer } from 'node:net';
import { join } from 'node:path';
import pg from 'pg';

/**
 * A private PostgreSQL cluster from Debian's `postgresql` package, started on
 * 127.0.0.1 for the app or the tests. Nothing here assumes a server is running.
 */
export interface Cluster {
  url: string;
  port: number;
  dataDir: string;
  /** Stops the server (fast shutdown). Safe to call twice. */
  stop(): Promise<void>;
}

export interface ClusterOptions {
  /** Folder that holds the cluster (created when missing). */
  dataDir: string;
  /** Preferred port; the next free one is taken when it is busy. */
  port: number;
  database: string;
  log?: (line: string) => void;
}

const superuser = 'app';
const isRoot = process.getuid?.() === 0;

/** Finds the newest /usr/lib/postgresql/<version>/bin that has initdb, installing Debian's package when root. */
export function findServerBinaries(log: (line: string) => void = () => {}): string {
  const found = scanBinaries();
  if (found) return found;
  const command = 'apt-get update && apt-get install -y --no-install-recommends postgresql';
  if (!isRoot) {
    throw new Error(`PostgreSQL server binaries were not found under /usr/lib/postgresql. Install them with:\n  sudo ${command}`);
  }
  log('PostgreSQL is not installed; installing Debian\'s postgresql package (apt-get)…');
  const env = { ...process.env, DEBIAN_FRONTEND: 'noninteractive' };
  let result = spawnSync('apt-get', ['install', '-y', '--no-install-recommends', 'postgresql'], { stdio: 'inherit', env });
  if (result.status !== 0) {
    spawnSync('apt-get', ['update'], { stdio: 'inherit', env });
    result = spawnSync('apt-get', ['install', '-y', '--no-install-recommends', 'postgresql'], { stdio: 'inherit', env });
  }
  const after = scanBinaries();
  if (result.status !== 0 || !after) throw new Error(`Installing PostgreSQL failed. Run:\n  ${command}`);
  return after;
}

function scanBinaries(): string | undefined {
  const root = '/usr/lib/postgresql';
  if (!existsSync(root)) return undefined;
  const versions = readdirSync(root)
    .filter((v) => existsSync(join(root, v, 'bin', 'initdb')) && existsSync(join(root, v, 'bin', 'pg_ctl')))
    .sort((a, b) => Number(b) - Number(a));
  return versions.length ? join(root, versions[0], 'bin') : undefined;
}

/** Runs a server binary; as root through `runuser -u postgres`, since initdb and postgres refuse to run as root. */
function runPg(bin: string, tool: string, args: string[]): string {
  const file = isRoot ? 'runuser' : join(bin, tool);
  const argv = isRoot ? ['-u', 'postgres', '--', join(bin, tool), ...args] : args;
  try {
    return execFileSync(file, argv, { cwd: '/', encoding: 'utf8', stdio: ['ignore', 'pipe', 'pipe'] });
  } catch (error) {
    const e = error as { stderr?: string; stdout?: string; message: string };
    throw new Error(`${tool} failed: ${(e.stderr || e.stdout || e.message).trim()}`);
  }
}

/**
 * The postgres user must reach every parent folder of the data directory; a
 * project cloned under a private folder is not reachable, so fall back to /tmp.
 */
function usableDataDir(preferred: string): string {
  if (!isRoot) return preferred;
  mkdirSync(preferred, { recursive: true });
  const reachable = spawnSync('runuser', ['-u', 'postgres', '--', 'test', '-x', preferred], { cwd: '/' }).status === 0;
  if (reachable) return preferred;
  const key = createHash('sha1').update(preferred).digest('hex').slice(0, 10);
  return join('/tmp', `tuckline-pg-${key}`);
}

function portIsFree(port: number): Promise<boolean> {
  return new Promise((resolve) => {
    const probe = createServer();
    probe.once('error', () => resolve(false));
    probe.listen(port, '127.0.0.1', () => probe.close(() => resolve(true)));
  });
}

export async function freePort(preferred: number): Promise<number> {
  for (let port = preferred; port < preferred + 200; port++) {
    if (await portIsFree(port)) return port;
  }
  throw new Error(`No free port found from ${preferred} to ${preferred + 199}.`);
}

function pidIsAlive(pid: number): boolean {
  try {
    process.kill(pid, 0);
    return true;
  } catch (error) {
    return (error as NodeJS.ErrnoException).code === 'EPERM';
  }
}

/** A postmaster.pid left by a killed run must not block the next start. */
function clearStalePidFile(dataDir: string, log: (line: string) => void): void {
  const pidFile = join(dataDir, 'postmaster.pid');
  if (!existsSync(pidFile)) return;
  const pid = Number(readFileSync(pidFile, 'utf8').split('\n')[0]);
  const alive = Number.isInteger(pid) && pid > 0 && pidIsAlive(pid);
  const isPostgres = alive && existsSync(`/proc/${pid}/comm`) && readFileSync(`/proc/${pid}/comm`, 'utf8').startsWith('postgres');
  if (!isPostgres) {
    log(`Removing a stale PostgreSQL pid file (process ${pid} is gone).`);
    rmSync(pidFile, { force: true });
  }
}

function runningPort(dataDir: string): number | undefined {
  const pidFile = join(dataDir, 'postmaster.pid');
  if (!existsSync(pidFile)) return undefined;
  // Line 4 of postmaster.pid is the port (PostgreSQL docs, "Database File Layout").
  const port = Number(readFileSync(pidFile, 'utf8').split('\n')[3]);
  return Number.isInteger(port) ? port : undefined;
}

/** Creates the cluster when missing, starts it on loopback, and creates the database. */
export async function startCluster(options: ClusterOptions): Promise<Cluster> {
  const log = options.log ?? (() => {});
  const bin = findServerBinaries(log);
  const dataDir = usableDataDir(options.dataDir);
  mkdirSync(dataDir, { recursive: true, mode: 0o700 });
  if (isRoot) chownSync(dataDir, uidOf('postgres'), gidOf('postgres'));

  if (!existsSync(join(dataDir, 'PG_VERSION'))) {
    log(`Creating a PostgreSQL cluster in ${dataDir}…`);
    runPg(bin, 'initdb', ['-D', dataDir, '-U', superuser, '--auth=trust', '-E', 'UTF8', '--locale=C.UTF-8', '--no-instructions']);
  }

  clearStalePidFile(dataDir, log);
  let port = runningPort(dataDir);
  let startedHere = false;
  if (port === undefined) {
    port = await freePort(options.port);
    const serverOptions = `-c listen_addresses=127.0.0.1 -p ${port} -c unix_socket_directories='' -c fsync=on`;
    runPg(bin, 'pg_ctl', ['-D', dataDir, '-l', `${dataDir}/server.log`, '-w', '-t', '30', '-o', serverOptions, 'start']);
    startedHere = true;
    log(`PostgreSQL started on 127.0.0.1:${port}.`);
  } else {
    log(`Reusing the PostgreSQL server already running on 127.0.0.1:${port}.`);
  }

  await ensureDatabase(port, options.database);
  let stopped = false;
  return {
    url: `postgres://${superuser}@127.0.0.1:${port}/${options.database}`,
    port,
    dataDir,
    async stop() {
      if (stopped || !startedHere && !existsSync(join(dataDir, 'postmaster.pid'))) return;
      stopped = true;
      runPg(bin, 'pg_ctl', ['-D', dataDir, '-m', 'fast', '-w', '-t', '30', 'stop']);
    },
  };
}

/** Stops a cluster synchronously, for process exit handlers. */
export function stopClusterSync(dataDir: string): void {
  const bin = scanBinaries();
  if (!bin || !existsSync(join(dataDir, 'postmaster.pid'))) return;
  try {
    runPg(bin, 'pg_ctl', ['-D', dataDir, '-m', 'fast', '-w', '-t', '30', 'stop']);
  } catch {
    // Already stopped by the time the handler ran.
  }
}

export async function ensureDatabase(port: number, database: string, template?: string): Promise<void> {
  const admin = new pg.Client({ host: '127.0.0.1', port, user: superuser, database: 'postgres' });
  await admin.connect();
  try {
    const { rowCount } = await admin.query('select 1 from pg_database where datname = $1', [database]);
    if (!rowCount) {
      const quoted = '"' + database.replaceAll('"', '""') + '"';
      const from = template ? ` template "${template.replaceAll('"', '""')}"` : '';
      await admin.query(`create database ${quoted}${from}`);
    }
  } finally {
    await admin.end();
  }
}

function uidOf(user: string): number {
  return Number(execFileSync('id', ['-u', user], { encoding: 'utf8' }).trim());
}

function gidOf(user: string): number {
  return Number(execFileSync('id', ['-g', user], { encoding: 'utf8' }).trim());
}
