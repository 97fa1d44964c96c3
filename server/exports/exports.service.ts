import { randomUUID } from 'node:crypto';
import { and, desc, eq, inArray } from 'drizzle-orm';
import type { ExportDto, ExportRequest } from '../../shared/schemas/export-request';
import { csvExportOptionsSchema, midiExportOptionsSchema } from '../../shared/schemas/export-options';
import type { Database } from '../db/client';
import { exportCsv, exportMidi, renderLaneWavFile } from '../engine/engine.service';
import { notFound, unprocessable } from '../http/errors';
import { parse } from '../http/validate';
import { lanes as lanesTable } from '../lanes/lanes.table';
import type { LanesService } from '../lanes/lanes.service';
import type { SongsRepository } from '../songs/songs.repository';
import type { FileStore } from '../storage/file-store';
import { users } from '../users/users.table';
import { exportFileName } from './export-file-name';
import { exportsTable } from './exports.table';
import { isUuid } from '../http/ids';

type ExportRow = typeof exportsTable.$inferSelect;
export const exportNotFound = () => notFound('exports.not_found', 'That export does not exist in this song.');

export function createExportsService(deps: { db: Database; store: FileStore; songs: SongsRepository; lanes: LanesService }) {
  const { db, store, songs, lanes } = deps;

  function toDto(row: ExportRow, creatorName: string | null, teamId: string): ExportDto {
    return {
      id: row.id,
      songId: row.songId,
      format: row.format,
      laneIds: row.laneIds,
      options: row.options,
      fileName: row.fileName,
      bytes: row.bytes,
      createdBy: row.createdBy ? { id: row.createdBy, displayName: creatorName ?? '' } : null,
      createdAt: row.createdAt.toISOString(),
      downloadUrl: `/api/teams/${teamId}/songs/${row.songId}/exports/${row.id}/file`,
    };
  }

  /** Builds the file, stores it, then records it; a failure on the way stores nothing. */
  async function create(teamId: string, songId: string, userId: string, request: ExportRequest & { options: NonNullable<ExportRequest['options']> }): Promise<ExportDto> {
    const song = await songs.get(teamId, songId);
    const rows = await db.select().from(lanesTable).where(and(eq(lanesTable.songId, songId), inArray(lanesTable.id, request.laneIds)));
    if (rows.length !== new Set(request.laneIds).size) throw notFound('lanes.not_found', 'One of those lanes does not exist in this song.');
    const ordered = request.laneIds.map((id) => rows.find((r) => r.id === id)!);
    const id = randomUUID();
    const ext = { csv: 'csv', midi: 'mid', wav: 'wav' }[request.format];
    const storageKey = `songs/${songId}/exports/${id}.${ext}`;
    const timeSignature: [number, 1 | 2 | 4 | 8 | 16 | 32] = [song.timeSignature.beats, song.timeSignature.beatUnit];
    let options: Record<string, unknown>;
    let bytes: number;

    if (request.format !== 'midi' && ordered.length !== 1) {
      throw unprocessable('exports.one_lane', 'CSV and WAV exports hold one lane each. Choose a single lane, or export MIDI for several.');
    }
    if (request.format === 'csv') {
      const { result, bass } = await lanes.stamp(songId, ordered[0]);
      const sampleRate = request.options.sampleRate ?? bass?.sampleRate ?? 48000;
      options = parse(csvExportOptionsSchema, { sampleRate, bpm: song.bpm, timeSignature, ppq: request.options.ppq }, 'options');
      bytes = await store.put(storageKey, exportCsv(result.curve, options));
    } else if (request.format === 'midi') {
      const stamped = [];
      for (const row of ordered) stamped.push(await lanes.stamp(songId, row));
      options = parse(
        midiExportOptionsSchema,
        { cc: request.options.cc, channel: request.options.channel, ppq: request.options.ppq, fourteenBit: request.options.fourteenBit, markerTrack: request.options.markerTrack, bpm: song.bpm, timeSignature },
        'options',
      );
      const midi = exportMidi(
        stamped.map((s) => ({ name: s.lane.name, curve: s.result.curve })),
        options,
        options['markerTrack'] ? stamped[0].map.hits : [],
        song.title,
      );
      bytes = await store.put(storageKey, midi);
    } else {
      const { lane, bass, bassActivity, map, durationSec } = await lanes.stamp(songId, ordered[0]);
      if (!bass || bass.format !== 'wav') throw unprocessable('exports.no_bass_stem', 'This lane has no bass stem to render. Pick its stem on the Tuck step first.');
      const temp = store.tempPath('.wav');
      try {
        await renderLaneWavFile(
          store.pathOf(bass.storageKey),
          map.hits,
          { name: lane.name, shape: lane.shape, baseGainDb: lane.baseGainDb, gate: { enabled: lane.gateEnabled, thresholdDbfs: lane.gateThresholdDbfs } },
          { durationSec, bassActivity, lowBandHz: request.options.lowBandHz },
          temp,
        );
        await store.adopt(temp, storageKey);
      } finally {
        await store.removeTemp(temp);
      }
      options = request.options.lowBandHz ? { lowBandHz: request.options.lowBandHz } : {};
      bytes = await store.size(storageKey);
    }

    const fileName = exportFileName(song.title, ordered.map((r) => r.name), request.format, new Date());
    try {
      const [row] = await db
        .insert(exportsTable)
        .values({ id, songId, format: request.format, laneIds: ordered.map((r) => r.id), options, fileName, storageKey, bytes, createdBy: userId })
        .returning();
      const [creator] = await db.select({ name: users.displayName }).from(users).where(eq(users.id, userId));
      return toDto(row, creator?.name ?? null, teamId);
    } catch (error) {
      await store.remove(storageKey);
      throw error;
    }
  }

  return {
    create,
    async list(teamId: string, songId: string): Promise<ExportDto[]> {
      const rows = await db
        .select({ row: exportsTable, name: users.displayName })
        .from(exportsTable)
        .leftJoin(users, eq(users.id, exportsTable.createdBy))
        .where(eq(exportsTable.songId, songId))
        .orderBy(desc(exportsTable.createdAt));
      return rows.map((r) => toDto(r.row, r.name, teamId));
    },
    async file(songId: string, exportId: string) {
      if (!isUuid(exportId)) throw exportNotFound();
      const [row] = await db.select().from(exportsTable).where(and(eq(exportsTable.songId, songId), eq(exportsTable.id, exportId)));
      if (!row) throw exportNotFound();
      return { row, path: store.pathOf(row.storageKey) };
    },
  };
}
export type ExportsService = ReturnType<typeof createExportsService>;
