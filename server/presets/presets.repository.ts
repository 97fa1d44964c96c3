import { and, asc, desc, eq, ilike, ne, or, sql } from 'drizzle-orm';
import { presetContentSchema, type PresetContent, type PresetContentInput, type PresetDto, type PresetStatus, type PresetVersionDto } from '../../shared/schemas/preset';
import type { Database, Executor } from '../db/client';
import { isUniqueViolation } from '../db/pg-errors';
import { conflict, notFound } from '../http/errors';
import { users } from '../users/users.table';
import { presets, presetVersions } from './presets.table';
import { starterPresets } from './starter-presets';
import { isUuid } from '../http/ids';

export const presetNotFound = () => notFound('presets.not_found', 'That preset does not exist in this team.');
export const presetNameTaken = () => conflict('presets.name_taken', 'This team already has a preset of that name in that genre. Pick another name.');

type PresetRow = typeof presets.$inferSelect;

/** Inserts a preset and its first version; constraint violations become domain errors. */
async function insertPreset(tx: Executor, teamId: string, authorId: string | null, content: PresetContent, status: PresetStatus): Promise<string> {
  try {
    const [row] = await tx
      .insert(presets)
      .values({ teamId, genre: content.genre, name: content.name, notes: content.notes, status, version: 1, authorId })
      .returning({ id: presets.id });
    await tx.insert(presetVersions).values({ presetId: row.id, version: 1, shape: content, savedBy: authorId });
    return row.id;
  } catch (error) {
    if (isUniqueViolation(error)) throw presetNameTaken();
    throw error;
  }
}

/** Every new team starts with the starter presets, published. */
export async function insertStarterPresets(tx: Executor, teamId: string, authorId: string | null): Promise<void> {
  for (const p of starterPresets) await insertPreset(tx, teamId, authorId, presetContentSchema.parse(p), 'published');
}

export function createPresetsRepository(db: Database) {
  const currentContent = sql<PresetContent>`(select ${presetVersions.shape} from ${presetVersions} where ${presetVersions.presetId} = ${presets.id} and ${presetVersions.version} = ${presets.version})`;

  function toDto(row: PresetRow, content: PresetContent, authorName: string | null): PresetDto {
    return {
      id: row.id,
      teamId: row.teamId,
      name: row.name,
      genre: row.genre,
      notes: row.notes,
      status: row.status,
      version: row.version,
      useCount: row.useCount,
      shape: content.shape,
      gateThresholdDbfs: content.gateThresholdDbfs,
      author: row.authorId ? { id: row.authorId, displayName: authorName ?? '' } : null,
      createdAt: row.createdAt.toISOString(),
      updatedAt: row.updatedAt.toISOString(),
    };
  }

  async function get(teamId: string, presetId: string, tx: Executor = db): Promise<PresetDto> {
    if (!isUuid(presetId)) throw presetNotFound();
    const [row] = await tx
      .select({ preset: presets, content: currentContent, authorName: users.displayName })
      .from(presets)
      .leftJoin(users, eq(users.id, presets.authorId))
      .where(and(eq(presets.teamId, teamId), eq(presets.id, presetId)));
    if (!row) throw presetNotFound();
    return toDto(row.preset, row.content, row.authorName);
  }

  return {
    get,
    async list(teamId: string, q: { genre?: string; q?: string; status?: PresetStatus; sort: 'name' | 'genre' | 'updatedAt' | 'useCount'; order: 'asc' | 'desc' }, onlyPublished: boolean) {
      const pattern = q.q ? `%${q.q.replace(/[\\%_]/g, (c) => '\\' + c)}%` : undefined;
      const column = { name: presets.name, genre: presets.genre, updatedAt: presets.updatedAt, useCount: presets.useCount }[q.sort];
      const rows = await db
        .select({ preset: presets, content: currentContent, authorName: users.displayName })
        .from(presets)
        .leftJoin(users, eq(users.id, presets.authorId))
        .where(
          and(
            eq(presets.teamId, teamId),
            q.genre ? eq(presets.genre, q.genre) : undefined,
            pattern ? or(ilike(presets.name, pattern), ilike(presets.notes, pattern)) : undefined,
            onlyPublished ? eq(presets.status, 'published') : q.status ? eq(presets.status, q.status) : ne(presets.status, 'retired'),
          ),
        )
        .orderBy(q.order === 'asc' ? asc(column) : desc(column), asc(presets.name));
      return rows.map((r) => toDto(r.preset, r.content, r.authorName));
    },
    async create(teamId: string, authorId: string, content: PresetContent, status: PresetStatus = 'draft'): Promise<PresetDto> {
      const id = await db.transaction((tx) => insertPreset(tx, teamId, authorId, content, status));
      return get(teamId, id);
    },
    /**
     * Saves a new version. The row is updated only while it is still at
     * `expectedVersion`, so of two people saving from the same version the
     * second gets 409 and nothing of theirs overwrites the first.
     */
    async saveVersion(teamId: string, presetId: string, expectedVersion: number, content: PresetContent, savedBy: string): Promise<PresetDto> {
      await get(teamId, presetId);
      await db.transaction(async (tx) => {
        let updated: { version: number }[];
        try {
          updated = await tx
            .update(presets)
            .set({ version: sql`${presets.version} + 1`, name: content.name, genre: content.genre, notes: content.notes })
            .where(and(eq(presets.teamId, teamId), eq(presets.id, presetId), eq(presets.version, expectedVersion)))
            .returning({ version: presets.version });
        } catch (error) {
          if (isUniqueViolation(error)) throw presetNameTaken();
          throw error;
        }
        if (!updated.length) {
          const current = await get(teamId, presetId, tx);
          throw conflict('presets.stale', `Someone saved version ${current.version} of this preset after you opened version ${expectedVersion}. Reload it and apply your change again.`, { currentVersion: current.version });
        }
        await tx.insert(presetVersions).values({ presetId, version: updated[0].version, shape: content, savedBy });
      });
      return get(teamId, presetId);
    },
    async setStatus(teamId: string, presetId: string, status: PresetStatus): Promise<PresetDto> {
      await get(teamId, presetId);
      await db.update(presets).set({ status }).where(and(eq(presets.teamId, teamId), eq(presets.id, presetId)));
      return get(teamId, presetId);
    },
    async versions(teamId: string, presetId: string): Promise<PresetVersionDto[]> {
      await get(teamId, presetId);
      const rows = await db
        .select({ v: presetVersions, name: users.displayName })
        .from(presetVersions)
        .leftJoin(users, eq(users.id, presetVersions.savedBy))
        .where(eq(presetVersions.presetId, presetId))
        .orderBy(desc(presetVersions.version));
      return rows.map((r) => ({
        version: r.v.version,
        content: presetContentSchema.parse(r.v.shape),
        savedBy: r.v.savedBy ? { id: r.v.savedBy, displayName: r.name ?? '' } : null,
        savedAt: r.v.createdAt.toISOString(),
      }));
    },
    async countUse(presetId: string): Promise<void> {
      await db.update(presets).set({ useCount: sql`${presets.useCount} + 1`, updatedAt: sql`${presets.updatedAt}` }).where(eq(presets.id, presetId));
    },
    async importMany(teamId: string, authorId: string, contents: PresetContent[]): Promise<PresetDto[]> {
      const ids = await db.transaction(async (tx) => {
        const out: string[] = [];
        for (const c of contents) out.push(await insertPreset(tx, teamId, authorId, c, 'draft'));
        return out;
      });
      return Promise.all(ids.map((id) => get(teamId, id)));
    },
  };
}
export type PresetsRepository = ReturnType<typeof createPresetsRepository>;
export type { PresetContentInput };
