import { bigint, index, jsonb, pgEnum, pgTable, text, uuid } from 'drizzle-orm/pg-core';
import { id, timestamps } from '../db/columns';
import { songs } from '../songs/songs.table';
import { users } from '../users/users.table';

export const exportFormatEnum = pgEnum('export_format', ['csv', 'midi', 'wav']);

/** Every export is recorded and can be downloaded again. */
export const exportsTable = pgTable(
  'exports',
  {
    ...id,
    songId: uuid()
      .notNull()
      .references(() => songs.id, { onDelete: 'cascade' }),
    format: exportFormatEnum().notNull(),
    laneIds: jsonb().$type<string[]>().notNull(),
    options: jsonb().$type<Record<string, unknown>>().notNull().default({}),
    fileName: text().notNull(),
    storageKey: text().notNull(),
    bytes: bigint({ mode: 'number' }).notNull(),
    createdBy: uuid().references(() => users.id, { onDelete: 'set null' }),
    ...timestamps,
  },
  (t) => [index('exports_song_idx').on(t.songId, t.createdAt)],
);
