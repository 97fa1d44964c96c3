import { asc, eq } from 'drizzle-orm';
import type { Database, Executor } from '../db/client';
import type { RevisionSummary, StoredHit } from './carry-over';
import { hitMaps, hits } from './hits.table';

export interface HitRow extends StoredHit {
  id: string;
  position: number;
}

export interface HitMapRecord {
  id: string;
  songId: string;
  sourceStemId: string | null;
  detection: Record<string, unknown>;
  revisionSummary: RevisionSummary | null;
  updatedAt: string;
  hits: HitRow[];
}

export function createHitsRepository(db: Database) {
  async function load(songId: string, tx: Executor = db): Promise<HitMapRecord | undefined> {
    const [map] = await tx.select().from(hitMaps).where(eq(hitMaps.songId, songId));
    if (!map) return undefined;
    const rows = await tx.select().from(hits).where(eq(hits.hitMapId, map.id)).orderBy(asc(hits.position));
    return {
      id: map.id,
      songId: map.songId,
      sourceStemId: map.sourceStemId,
      detection: map.detection,
      revisionSummary: (map.revisionSummary as RevisionSummary | null) ?? null,
      updatedAt: map.updatedAt.toISOString(),
      hits: rows.map((r) => ({
        id: r.id,
        position: r.position,
        timeSec: r.timeSec,
        ...(r.sample == null ? {} : { sample: r.sample }),
        strength: r.strength,
        enabled: r.enabled,
        depthDb: r.depthDb,
        origin: r.origin,
      })),
    };
  }

  /** Replaces the song's hits in one transaction: readers see the old map or the new one, never half. */
  async function replace(
    songId: string,
    values: { sourceStemId?: string | null; detection?: Record<string, unknown>; revisionSummary?: RevisionSummary | null; hits: StoredHit[] },
    tx: Executor = db,
  ): Promise<void> {
    const sorted = [...values.hits].sort((a, b) => a.timeSec - b.timeSec);
    const [existing] = await tx.select({ id: hitMaps.id }).from(hitMaps).where(eq(hitMaps.songId, songId)).for('update');
    let mapId: string;
    if (existing) {
      mapId = existing.id;
      const patch: Partial<typeof hitMaps.$inferInsert> = { updatedAt: new Date() };
      if (values.sourceStemId !== undefined) patch.sourceStemId = values.sourceStemId;
      if (values.detection !== undefined) patch.detection = values.detection;
      if (values.revisionSummary !== undefined) patch.revisionSummary = values.revisionSummary as Record<string, unknown> | null;
      await tx.update(hitMaps).set(patch).where(eq(hitMaps.id, mapId));
      await tx.delete(hits).where(eq(hits.hitMapId, mapId));
    } else {
      const [created] = await tx
        .insert(hitMaps)
        .values({
          songId,
          sourceStemId: values.sourceStemId ?? null,
          detection: values.detection ?? {},
          revisionSummary: (values.revisionSummary ?? null) as Record<string, unknown> | null,
        })
        .returning({ id: hitMaps.id });
      mapId = created.id;
    }
    // Inserted in chunks: PostgreSQL allows at most 65535 bind parameters per statement.
    for (let i = 0; i < sorted.length; i += 2000) {
      await tx.insert(hits).values(
        sorted.slice(i, i + 2000).map((h, j) => ({
          hitMapId: mapId,
          position: i + j,
          timeSec: h.timeSec,
          sample: h.sample ?? null,
          strength: h.strength,
          enabled: h.enabled,
          depthDb: h.depthDb ?? null,
          origin: h.origin,
        })),
      );
    }
  }

  return {
    load,
    replace,
    async acknowledge(songId: string): Promise<void> {
      await db.update(hitMaps).set({ revisionSummary: null }).where(eq(hitMaps.songId, songId));
    },
  };
}
export type HitsRepository = ReturnType<typeof createHitsRepository>;
