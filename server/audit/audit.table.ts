import { index, jsonb, pgTable, text, timestamp, uuid } from 'drizzle-orm/pg-core';
import { id } from '../db/columns';
import { teams } from '../teams/teams.table';
import { users } from '../users/users.table';

/** Who did what, when, in which team. Rows are only ever added. */
export const auditEvents = pgTable(
  'audit_events',
  {
    ...id,
    teamId: uuid().references(() => teams.id, { onDelete: 'cascade' }),
    actorId: uuid().references(() => users.id, { onDelete: 'set null' }),
    action: text().notNull(),
    subjectType: text(),
    subjectId: text(),
    details: jsonb().$type<Record<string, unknown>>().notNull().default({}),
    createdAt: timestamp({ withTimezone: true }).notNull().defaultNow(),
  },
  (t) => [index('audit_team_created_idx').on(t.teamId, t.createdAt)],
);
