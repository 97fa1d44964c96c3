import { and, asc, eq, max, sql } from 'drizzle-orm';
import { tuckShapeSchema } from '../../shared/schemas/tuck-shape';
import type { LaneDto } from '../../shared/schemas/lane';
import type { Database } from '../db/client';
import { conflict, notFound } from '../http/errors';
import { lanes } from './lanes.table';
import { isUuid } from '../http/ids';

export type LaneRow = typeof lanes.$inferSelect;

export const laneNotFound = () => notFound('lanes.not_found', 'That lane does not exist in this song.');

export function toLaneDto(row: LaneRow): LaneDto {
  return {
    id: row.id,
    songId: row.songId,
    name: row.name,
    position: row.position,
    bassSlot: row.bassSlot,
    shape: tuckShapeSchema.parse(row.shape),
    baseGainDb: row.baseGainDb,
    gateEnabled: row.gateEnabled,
    gateThresholdDbfs: row.gateThresholdDbfs,
    muted: row.muted,
    presetId: row.presetId,
    presetVersion: row.presetVersion,
    revision: row.revision,
    updatedAt: row.updatedAt.toISOString(),
  };
}

type LaneValues = Partial<Omit<typeof lanes.$inferInsert, 'id' | 'songId' | 'revision'>>;

export function createLanesRepository(db: Database) {
  async function get(songId: string, laneId: string): Promise<LaneRow> {
    if (!isUuid(laneId)) throw laneNotFound();
    const [row] = await db.select().from(lanes).where(and(eq(lanes.songId, songId), eq(lanes.id, laneId)));
    if (!row) throw laneNotFound();
    return row;
  }
  return {
    get,
    async list(songId: string): Promise<LaneRow[]> {
      return db.select().from(lanes).where(eq(lanes.songId, songId)).orderBy(asc(lanes.position), asc(lanes.createdAt));
    },
    async create(songId: string, values: LaneValues & { name: string; shape: unknown }): Promise<LaneRow> {
      const [{ top }] = await db.select({ top: max(lanes.position) }).from(lanes).where(eq(lanes.songId, songId));
      const [row] = await db
        .insert(lanes)
        .values({ ...values, songId, position: top == null ? 0 : top + 1 })
        .returning();
      return row;
    },
    /**
     * Saves a change. With `expectedRevision`, the row must still be at that
     * revision (optimistic concurrency): a stale edit answers 409, never overwrites.
     */
    async update(songId: string, laneId: string, values: LaneValues, expectedRevision?: number): Promise<LaneRow> {
      await get(songId, laneId);
      const where = and(eq(lanes.songId, songId), eq(lanes.id, laneId), expectedRevision === undefined ? undefined : eq(lanes.revision, expectedRevision));
      const [row] = await db
        .update(lanes)
        .set({ ...values, revision: sql`${lanes.revision} + 1` })
        .where(where)
        .returning();
      if (!row) throw conflict('lanes.stale', 'Someone saved this lane after you opened it. Reload it, then apply your change again.');
      return row;
    },
    async remove(songId: string, laneId: string): Promise<void> {
      await get(songId, laneId);
      await db.delete(lanes).where(and(eq(lanes.songId, songId), eq(lanes.id, laneId)));
    },
  };
}
export type LanesRepository = ReturnType<typeof createLanesRepository>;
