import { index, integer, pgTable, real, text, uuid } from 'drizzle-orm/pg-core';
import { id, timestamps } from '../db/columns';
import { teams } from '../teams/teams.table';
import { users } from '../users/users.table';

export const songs = pgTable(
  'songs',
  {
    ...id,
    teamId: uuid()
      .notNull()
      .references(() => teams.id, { onDelete: 'cascade' }),
    title: text().notNull(),
    artistAlias: text().notNull().default(''),
    bpm: real().notNull(),
    timeSignatureBeats: integer().notNull().default(4),
    timeSignatureUnit: integer().notNull().default(4),
    notes: text().notNull().default(''),
    createdBy: uuid().references(() => users.id, { onDelete: 'set null' }),
    ...timestamps,
  },
  (t) => [index('songs_team_updated_idx').on(t.teamId, t.updatedAt)],
);
