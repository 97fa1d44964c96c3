import { and, asc, desc, eq, max } from 'drizzle-orm';
import type { Database, Executor } from '../db/client';
import { notFound } from '../http/errors';
import { users } from '../users/users.table';
import { stems } from './stems.table';
import { isUuid } from '../http/ids';

export type StemRow = typeof stems.$inferSelect;
export type NewStem = Omit<typeof stems.$inferInsert, 'revision' | 'isCurrent' | 'id'> & { id: string };

export const stemNotFound = () => notFound('stems.not_found', 'That stem does not exist in this song.');


export function toStemDto(row: StemRow & { uploaderName?: string | null }) {
  return {
    id: row.id,
    songId: row.songId,
    role: row.role,
    slot: row.slot,
    revision: row.revision,
    isCurrent: row.isCurrent,
    originalName: row.originalName,
    format: row.format,
    sampleRate: row.sampleRate,
    bitDepth: row.bitDepth,
    channels: row.channels,
    durationSec: row.durationSec,
    bytes: row.bytes,
    sha256: row.sha256,
    uploadedBy: row.uploadedBy ? { id: row.uploadedBy, displayName: row.uploaderName ?? '' } : null,
    createdAt: row.createdAt.toISOString(),
  };
}
export type StemDto = ReturnType<typeof toStemDto>;

export function createStemsRepository(db: Database) {
  return {
    async list(songId: string) {
      const rows = await db
        .select({ stem: stems, uploaderName: users.displayName })
        .from(stems)
        .leftJoin(users, eq(users.id, stems.uploadedBy))
        .where(eq(stems.songId, songId))
        .orderBy(asc(stems.slot), desc(stems.revision));
      return rows.map((r) => toStemDto({ ...r.stem, uploaderName: r.uploaderName }));
    },
    async get(songId: string, stemId: string): Promise<StemRow> {
      if (!isUuid(stemId)) throw stemNotFound();
      const [row] = await db.select().from(stems).where(and(eq(stems.songId, songId), eq(stems.id, stemId)));
      if (!row) throw stemNotFound();
      return row;
    },
    async current(songId: string, slot: string): Promise<StemRow | undefined> {
      const [row] = await db
        .select()
        .from(stems)
        .where(and(eq(stems.songId, songId), eq(stems.slot, slot), eq(stems.isCurrent, true)));
      return row;
    },
    async currentOfRole(songId: string, role: StemRow['role']): Promise<StemRow[]> {
      return db
        .select()
        .from(stems)
        .where(and(eq(stems.songId, songId), eq(stems.role, role), eq(stems.isCurrent, true)))
        .orderBy(asc(stems.slot));
    },
    /** Adds the next revision of a slot and makes it current, in one transaction (the slot's rows are locked). */
    async addRevision(values: NewStem, tx: Executor): Promise<StemRow> {
      await tx.select({ id: stems.id }).from(stems).where(and(eq(stems.songId, values.songId), eq(stems.slot, values.slot))).for('update');
      const [{ top }] = await tx
        .select({ top: max(stems.revision) })
        .from(stems)
        .where(and(eq(stems.songId, values.songId), eq(stems.slot, values.slot)));
      await tx.update(stems).set({ isCurrent: false }).where(and(eq(stems.songId, values.songId), eq(stems.slot, values.slot)));
      const [row] = await tx
        .insert(stems)
        .values({ ...values, revision: (top ?? 0) + 1, isCurrent: true })
        .returning();
      return row;
    },
    async makeCurrent(row: StemRow, tx: Executor = db): Promise<void> {
      await tx.update(stems).set({ isCurrent: false }).where(and(eq(stems.songId, row.songId), eq(stems.slot, row.slot)));
      await tx.update(stems).set({ isCurrent: true }).where(eq(stems.id, row.id));
    },
  };
}
export type StemsRepository = ReturnType<typeof createStemsRepository>;
