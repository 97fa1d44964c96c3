import { boolean, index, integer, jsonb, pgTable, real, text, uuid } from 'drizzle-orm/pg-core';
import { id, timestamps } from '../db/columns';
import { presets } from '../presets/presets.table';
import { songs } from '../songs/songs.table';

/** One target of ducking: a bass stem slot with its tuck shape, base gain, gate and export settings. */
export const lanes = pgTable(
  'lanes',
  {
    ...id,
    songId: uuid()
      .notNull()
      .references(() => songs.id, { onDelete: 'cascade' }),
    name: text().notNull(),
    position: integer().notNull().default(0),
    /** The bass stem slot this lane ducks (its current revision is used). */
    bassSlot: text(),
    /** The tuck shape (shared/schemas/tuck-shape.ts). */
    shape: jsonb().$type<unknown>().notNull(),
    baseGainDb: real().notNull().default(0),
    gateEnabled: boolean().notNull().default(true),
    gateThresholdDbfs: real().notNull().default(-50),
    muted: boolean().notNull().default(false),
    presetId: uuid().references(() => presets.id, { onDelete: 'set null' }),
    presetVersion: integer(),
    exportOptions: jsonb().$type<Record<string, unknown>>().notNull().default({}),
    /** Optimistic concurrency: bumped on every save. */
    revision: integer().notNull().default(1),
    ...timestamps,
  },
  (t) => [index('lanes_song_idx').on(t.songId, t.position)],
);
