import { index, pgTable, text, timestamp, uuid } from 'drizzle-orm/pg-core';
import { roleEnum, teams } from '../teams/teams.table';
import { id, timestamps } from '../db/columns';
import { users } from '../users/users.table';

/** Invitations by e-mail (issue 5): single-use, expiring; only a hash of the token is stored. */
export const invitations = pgTable(
  'invitations',
  {
    ...id,
    teamId: uuid()
      .notNull()
      .references(() => teams.id, { onDelete: 'cascade' }),
    email: text().notNull(),
    role: roleEnum().notNull(),
    tokenHash: text().notNull().unique(),
    invitedBy: uuid().references(() => users.id, { onDelete: 'set null' }),
    expiresAt: timestamp({ withTimezone: true }).notNull(),
    acceptedAt: timestamp({ withTimezone: true }),
    revokedAt: timestamp({ withTimezone: true }),
    ...timestamps,
  },
  (t) => [index('invitations_team_idx').on(t.teamId)],
);
