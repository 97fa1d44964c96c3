import { index, jsonb, pgEnum, pgTable, text, uniqueIndex, uuid } from 'drizzle-orm/pg-core';
import { roles } from '../../shared/schemas/team';
import { id, timestamps } from '../db/columns';
import { users } from '../users/users.table';

export const roleEnum = pgEnum('team_role', roles);

export const teams = pgTable('teams', {
  ...id,
  name: text().notNull(),
  /** Team settings (default export options, default preset per genre): validated by a shared zod schema. */
  settings: jsonb().$type<Record<string, unknown>>().notNull().default({}),
  ...timestamps,
});

export const memberships = pgTable(
  'memberships',
  {
    ...id,
    teamId: uuid()
      .notNull()
      .references(() => teams.id, { onDelete: 'cascade' }),
    userId: uuid()
      .notNull()
      .references(() => users.id, { onDelete: 'cascade' }),
    role: roleEnum().notNull(),
    ...timestamps,
  },
  (t) => [uniqueIndex('memberships_team_user_unique').on(t.teamId, t.userId), index('memberships_user_idx').on(t.userId)],
);
