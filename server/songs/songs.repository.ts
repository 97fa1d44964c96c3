import { and, asc, desc, eq, ilike, or, sql, count } from 'drizzle-orm';
import type { Song, SongListQuery, TimeSignature } from '../../shared/schemas/song';
import type { Database } from '../db/client';
import { hitMaps, hits } from '../hits/hits.table';
import { notFound } from '../http/errors';
import { stems } from '../stems/stems.table';
import { users } from '../users/users.table';
import { songs } from './songs.table';
import { isUuid } from '../http/ids';

export interface SongValues {
  title: string;
  artistAlias: string;
  bpm: number;
  timeSignature: TimeSignature;
  notes: string;
}

export const songNotFound = () => notFound('songs.not_found', 'That song does not exist in this team.');

const sortColumns = {
  title: songs.title,
  artistAlias: songs.artistAlias,
  bpm: songs.bpm,
  updatedAt: songs.updatedAt,
  createdAt: songs.createdAt,
} as const;

function toColumns<V extends Partial<SongValues>>(values: V) {
  const { timeSignature, ...rest } = values;
  return {
    ...rest,
    ...(timeSignature ? { timeSignatureBeats: timeSignature.beats, timeSignatureUnit: timeSignature.beatUnit } : {}),
  };
}


export function createSongsRepository(db: Database) {
  const stemCount = sql<number>`(select count(*)::int from ${stems} where ${stems.songId} = ${songs.id} and ${stems.isCurrent})`;
  const hitCount = sql<number | null>`(select count(*)::int from ${hits} inner join ${hitMaps} on ${hitMaps.id} = ${hits.hitMapId} where ${hitMaps.songId} = ${songs.id})`;
  const hasMap = sql<boolean>`exists (select 1 from ${hitMaps} where ${hitMaps.songId} = ${songs.id})`;

  const selection = {
    song: songs,
    creatorName: users.displayName,
    stemCount,
    hitCount,
    hasMap,
  };

  function toSong(row: { song: typeof songs.$inferSelect; creatorName: string | null; stemCount: number; hitCount: number | null; hasMap: boolean }): Song {
    const s = row.song;
    return {
      id: s.id,
      teamId: s.teamId,
      title: s.title,
      artistAlias: s.artistAlias,
      bpm: s.bpm,
      timeSignature: { beats: s.timeSignatureBeats, beatUnit: s.timeSignatureUnit as TimeSignature['beatUnit'] },
      notes: s.notes,
      createdBy: s.createdBy ? { id: s.createdBy, displayName: row.creatorName ?? '' } : null,
      stemCount: row.stemCount,
      hitCount: row.hasMap ? row.hitCount : null,
      createdAt: s.createdAt.toISOString(),
      updatedAt: s.updatedAt.toISOString(),
    };
  }

  async function get(teamId: string, songId: string): Promise<Song> {
    if (!isUuid(songId)) throw songNotFound();
    const [row] = await db
      .select(selection)
      .from(songs)
      .leftJoin(users, eq(users.id, songs.createdBy))
      .where(and(eq(songs.teamId, teamId), eq(songs.id, songId)));
    if (!row) throw songNotFound();
    return toSong(row);
  }

  return {
    get,
    async list(teamId: string, q: SongListQuery) {
      const pattern = q.q ? `%${q.q.replace(/[\\%_]/g, (c) => '\\' + c)}%` : undefined;
      const where = and(
        eq(songs.teamId, teamId),
        pattern ? or(ilike(songs.title, pattern), ilike(songs.artistAlias, pattern), ilike(songs.notes, pattern)) : undefined,
      );
      const column = sortColumns[q.sort];
      const [rows, [{ total }]] = await Promise.all([
        db
          .select(selection)
          .from(songs)
          .leftJoin(users, eq(users.id, songs.createdBy))
          .where(where)
          .orderBy(q.order === 'asc' ? asc(column) : desc(column), asc(songs.id))
          .limit(q.pageSize)
          .offset(q.page * q.pageSize),
        db.select({ total: count() }).from(songs).where(where),
      ]);
      return { items: rows.map(toSong), total };
    },
    async create(teamId: string, createdBy: string, values: SongValues): Promise<Song> {
      const [row] = await db.insert(songs).values({ teamId, createdBy, ...toColumns(values) }).returning({ id: songs.id });
      return get(teamId, row.id);
    },
    async update(teamId: string, songId: string, values: Partial<SongValues>): Promise<Song> {
      await get(teamId, songId);
      await db.update(songs).set(toColumns(values)).where(and(eq(songs.teamId, teamId), eq(songs.id, songId)));
      return get(teamId, songId);
    },
    async touch(songId: string): Promise<void> {
      await db.update(songs).set({ updatedAt: new Date() }).where(eq(songs.id, songId));
    },
    async remove(teamId: string, songId: string): Promise<void> {
      await get(teamId, songId);
      await db.delete(songs).where(and(eq(songs.teamId, teamId), eq(songs.id, songId)));
    },
  };
}
export type SongsRepository = ReturnType<typeof createSongsRepository>;
