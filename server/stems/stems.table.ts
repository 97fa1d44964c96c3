import { bigint, boolean, index, integer, jsonb, pgEnum, pgTable, real, text, uniqueIndex, uuid } from 'drizzle-orm/pg-core';
import { id, timestamps } from '../db/columns';
import { songs } from '../songs/songs.table';
import { users } from '../users/users.table';

export const stemRoleEnum = pgEnum('stem_role', ['kick', 'bass', 'other']);
export const stemFormatEnum = pgEnum('stem_format', ['wav', 'midi']);

/** One uploaded file. A new upload for the same song and slot is a new revision; old revisions stay. */
export const stems = pgTable(
  'stems',
  {
    ...id,
    songId: uuid()
      .notNull()
      .references(() => songs.id, { onDelete: 'cascade' }),
    role: stemRoleEnum().notNull(),
    /** Groups revisions of one stem (e.g. "808" and "synth bass" are two bass slots). */
    slot: text().notNull(),
    revision: integer().notNull(),
    /** The revision the song uses now (restoring an old one moves this flag). */
    isCurrent: boolean().notNull().default(true),
    originalName: text().notNull(),
    format: stemFormatEnum().notNull(),
    sampleRate: integer(),
    bitDepth: integer(),
    channels: integer(),
    durationSec: real().notNull(),
    bytes: bigint({ mode: 'number' }).notNull(),
    sha256: text().notNull(),
    storageKey: text().notNull(),
    /** Min/max peaks at a few zoom levels, computed once on upload. */
    overview: jsonb().$type<unknown>(),
    uploadedBy: uuid().references(() => users.id, { onDelete: 'set null' }),
    ...timestamps,
  },
  (t) => [
    uniqueIndex('stems_song_slot_revision_unique').on(t.songId, t.slot, t.revision),
    index('stems_song_idx').on(t.songId),
  ],
);
