import { and, count, desc, eq, gte, like, lte } from 'drizzle-orm';
import { Router } from 'express';
import { auditQuerySchema } from '../../shared/schemas/invitation';
import type { Database } from '../db/client';
import { requirePermission, teamOf } from '../http/auth.middleware';
import { query } from '../http/validate';
import { users } from '../users/users.table';
import { auditEvents } from './audit.table';

/** `/api/teams/:teamId/audit`: the team's trail, newest first, for owners. */
export function auditRoutes(deps: { db: Database }): Router {
  const router = Router({ mergeParams: true });
  router.get('/', requirePermission('viewAudit'), async (req, res) => {
    const { teamId } = teamOf(req);
    const q = query(req, auditQuerySchema);
    const where = and(
      eq(auditEvents.teamId, teamId),
      q.action ? like(auditEvents.action, `${q.action.replace(/[\\%_]/g, (c) => '\\' + c)}%`) : undefined,
      q.actorId ? eq(auditEvents.actorId, q.actorId) : undefined,
      q.from ? gte(auditEvents.createdAt, new Date(q.from)) : undefined,
      q.to ? lte(auditEvents.createdAt, new Date(q.to)) : undefined,
    );
    const [rows, [{ total }]] = await Promise.all([
      deps.db
        .select({ e: auditEvents, actorName: users.displayName })
        .from(auditEvents)
        .leftJoin(users, eq(users.id, auditEvents.actorId))
        .where(where)
        .orderBy(desc(auditEvents.createdAt), desc(auditEvents.id))
        .limit(q.pageSize)
        .offset(q.page * q.pageSize),
      deps.db.select({ total: count() }).from(auditEvents).where(where),
    ]);
    res.json({
      total,
      items: rows.map((r) => ({
        id: r.e.id,
        action: r.e.action,
        actor: r.e.actorId ? { id: r.e.actorId, displayName: r.actorName ?? '' } : null,
        subjectType: r.e.subjectType,
        subjectId: r.e.subjectId,
        details: r.e.details,
        at: r.e.createdAt.toISOString(),
      })),
    });
  });
  return router;
}
