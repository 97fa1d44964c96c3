import { boolean, index, integer, jsonb, pgEnum, pgTable, real, uuid } from 'drizzle-orm/pg-core';
import { id, timestamps } from '../db/columns';
import { songs } from '../songs/songs.table';
import { stems } from '../stems/stems.table';

/** One hit map per song: detection results plus the engineer's edits. */
export const hitMaps = pgTable('hit_maps', {
  ...id,
  songId: uuid()
    .notNull()
    .unique()
    .references(() => songs.id, { onDelete: 'cascade' }),
  sourceStemId: uuid().references(() => stems.id, { onDelete: 'set null' }),
  detection: jsonb().$type<Record<string, unknown>>().notNull().default({}),
  /** What changed against the previous revision's detection, shown until acknowledged. */
  revisionSummary: jsonb().$type<Record<string, unknown> | null>(),
  ...timestamps,
});

export const hitOriginEnum = pgEnum('hit_origin', ['detected', 'added']);

export const hits = pgTable(
  'hits',
  {
    ...id,
    hitMapId: uuid()
      .notNull()
      .references(() => hitMaps.id, { onDelete: 'cascade' }),
    position: integer().notNull(),
    timeSec: real().notNull(),
    sample: integer(),
    strength: real().notNull(),
    enabled: boolean().notNull().default(true),
    depthDb: real(),
    origin: hitOriginEnum().notNull().default('detected'),
  },
  (t) => [index('hits_map_position_idx').on(t.hitMapId, t.position)],
);
