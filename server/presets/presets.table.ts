import { index, integer, jsonb, pgEnum, pgTable, text, uniqueIndex, uuid } from 'drizzle-orm/pg-core';
import { id, timestamps } from '../db/columns';
import { teams } from '../teams/teams.table';
import { users } from '../users/users.table';

export const presetStatusEnum = pgEnum('preset_status', ['draft', 'published', 'retired']);

/** A saved tuck shape with its defaults, filed under a genre, shared with the team. */
export const presets = pgTable(
  'presets',
  {
    ...id,
    teamId: uuid()
      .notNull()
      .references(() => teams.id, { onDelete: 'cascade' }),
    genre: text().notNull(),
    name: text().notNull(),
    notes: text().notNull().default(''),
    status: presetStatusEnum().notNull().default('draft'),
    /** Current version number; each save adds a row to preset_versions. */
    version: integer().notNull().default(1),
    useCount: integer().notNull().default(0),
    authorId: uuid().references(() => users.id, { onDelete: 'set null' }),
    ...timestamps,
  },
  (t) => [uniqueIndex('presets_team_genre_name_unique').on(t.teamId, t.genre, t.name), index('presets_team_idx').on(t.teamId)],
);

export const presetVersions = pgTable(
  'preset_versions',
  {
    ...id,
    presetId: uuid()
      .notNull()
      .references(() => presets.id, { onDelete: 'cascade' }),
    version: integer().notNull(),
    /** The tuck shape and its defaults (validated by shared/schemas/tuck-shape.ts). */
    shape: jsonb().$type<unknown>().notNull(),
    savedBy: uuid().references(() => users.id, { onDelete: 'set null' }),
    ...timestamps,
  },
  (t) => [uniqueIndex('preset_versions_preset_version_unique').on(t.presetId, t.version)],
);
