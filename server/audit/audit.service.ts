import type { Database, Executor } from '../db/client';
import { auditEvents } from './audit.table';

export interface AuditEntry {
  teamId?: string | null;
  actorId?: string | null;
  action: string;
  subjectType?: string;
  subjectId?: string;
  details?: Record<string, unknown>;
}

export function createAudit(db: Database) {
  return {
    async record(entry: AuditEntry, tx: Executor = db): Promise<void> {
      await tx.insert(auditEvents).values({ ...entry, details: entry.details ?? {} });
    },
  };
}
export type Audit = ReturnType<typeof createAudit>;
