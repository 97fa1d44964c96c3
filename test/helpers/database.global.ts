import { rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import type { TestProject } from 'vitest/node';
import { createDatabase } from '../../server/db/client';
import { startCluster, stopClusterSync } from '../../server/db/cluster';
import { migrateDatabase } from '../../server/db/migrate';

export const templateDatabase = 'tuckline_template';

declare module 'vitest' {
  export interface ProvidedContext {
    pgPort: number;
    pgTemplate: string;
  }
}

/**
 * One throw-away PostgreSQL cluster for the run: a migrated template database,
 * copied per test file (`CREATE DATABASE … TEMPLATE`), then stopped and deleted.
 */
export default async function setup(project: TestProject) {
  const dataDir = join(tmpdir(), `tuckline-test-pg-${process.pid}`);
  rmSync(dataDir, { recursive: true, force: true });
  const cluster = await startCluster({ dataDir, port: 55400 + (process.pid % 500), database: templateDatabase });
  const db = createDatabase(cluster.url);
  await migrateDatabase(db);
  await db.$client.end();
  // If the run is interrupted (Ctrl-C), stop the cluster anyway: the tests leave nothing running.
  const stopOnExit = () => stopClusterSync(cluster.dataDir);
  process.once('exit', stopOnExit);
  for (const signal of ['SIGINT', 'SIGTERM'] as const) process.once(signal, () => process.exit(130));
  project.provide('pgPort', cluster.port);
  project.provide('pgTemplate', templateDatabase);
  return async () => {
    process.off('exit', stopOnExit);
    await cluster.stop();
    rmSync(cluster.dataDir, { recursive: true, force: true });
  };
}
