import { join } from 'node:path';
import { migrate } from 'drizzle-orm/node-postgres/migrator';
import { projectRoot } from '../config/env';
import type { Database } from './client';

export const migrationsFolder = join(projectRoot, 'migrations');

/** Applies the committed drizzle-kit migrations; already-applied ones are skipped. */
export async function migrateDatabase(db: Database): Promise<void> {
  await migrate(db, { migrationsFolder });
}
