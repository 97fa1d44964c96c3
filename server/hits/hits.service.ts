import type { DetectRequest, HitEdit, HitMapDto } from '../../shared/schemas/hit-map';
import { averageKick, type AverageKick } from '../../shared/dsp/average-kick';
import { detectKickFile } from '../audio/kick-detection';
import { readWavMono } from '../audio/wav-file';
import type { Database } from '../db/client';
import { notFound, unprocessable } from '../http/errors';
import type { StemRow, StemsRepository } from '../stems/stems.repository';
import type { FileStore } from '../storage/file-store';
import { carryOverEdits, type StoredHit } from './carry-over';
import type { HitsRepository } from './hits.repository';

export const noHitMap = () => notFound('hits.no_hit_map', 'This song has no hits yet. Upload a kick stem or kick MIDI and run detection.');

export function createHitsService(deps: { db: Database; hits: HitsRepository; stems: StemsRepository; store: FileStore }) {
  const { db, hits, stems, store } = deps;

  async function get(songId: string): Promise<HitMapDto> {
    const map = await hits.load(songId);
    if (!map) throw noHitMap();
    return map;
  }

  /** The kick source the song uses now: the current revision of its kick slot (the newest kick slot if several). */
  async function kickSource(songId: string): Promise<StemRow> {
    const kicks = await stems.currentOfRole(songId, 'kick');
    if (!kicks.length) throw unprocessable('hits.no_kick_source', 'Upload a kick stem (WAV) or a MIDI file of the kick part first.');
    return kicks.sort((a, b) => b.createdAt.getTime() - a.createdAt.getTime())[0];
  }

  /**
   * Runs detection on the kick source and stores the hit map; edits made on the
   * previous map carry over to hits that still match (server/hits/carry-over.ts).
   */
  async function detect(songId: string, request: DetectRequest = {}, source?: StemRow): Promise<HitMapDto> {
    const stem = source ?? (await kickSource(songId));
    const result = await detectKickFile(store.pathOf(stem.storageKey), {
      kind: stem.format === 'midi' ? 'midi' : 'audio',
      detection: request.detection,
      midi: request.midi,
    });
    await db.transaction(async (tx) => {
      const previous = await hits.load(songId, tx);
      const { hits: merged, summary } = carryOverEdits(previous?.hits ?? [], result.hits);
      const sourceChanged = previous && previous.sourceStemId !== stem.id;
      await hits.replace(
        songId,
        {
          sourceStemId: stem.id,
          detection: { ...request, source: result.source, sampleRate: result.sampleRate, durationSec: result.durationSec, detectedCount: result.hits.length },
          revisionSummary: sourceChanged ? summary : previous ? previous.revisionSummary : null,
          hits: merged,
        },
        tx,
      );
    });
    return get(songId);
  }

  /** Applies one batch of hit edits in a transaction. */
  async function edit(songId: string, change: HitEdit): Promise<HitMapDto> {
    await db.transaction(async (tx) => {
      const map = await hits.load(songId, tx);
      if (!map) throw noHitMap();
      const byId = new Map(map.hits.map((h) => [h.id, { ...h }]));
      for (const u of change.update ?? []) {
        const h = byId.get(u.id);
        if (!h) throw notFound('hits.not_found', 'One of those hits is not in this song\'s hit map. Reload and try again.');
        if (u.enabled !== undefined) h.enabled = u.enabled;
        if (u.depthDb !== undefined) h.depthDb = u.depthDb;
      }
      for (const id of change.remove ?? []) {
        if (!byId.delete(id)) throw notFound('hits.not_found', 'One of those hits is not in this song\'s hit map. Reload and try again.');
      }
      if (change.range) {
        const { fromSec, toSec, enabled } = change.range;
        for (const h of byId.values()) if (h.timeSec >= fromSec && h.timeSec <= toSec) h.enabled = enabled;
      }
      const next: StoredHit[] = [...byId.values()].map(({ id: _id, position: _p, ...h }) => h);
      for (const a of change.add ?? []) next.push({ timeSec: a.timeSec, strength: a.strength ?? 1, enabled: true, depthDb: null, origin: 'added' });
      await hits.replace(songId, { hits: next }, tx);
    });
    return get(songId);
  }

  const averages = new Map<string, AverageKick>();
  /** The kick averaged over its hits (for drawing under the tuck shape); cached per kick revision and hit map. */
  async function averageKickOf(songId: string): Promise<AverageKick> {
    const map = await get(songId);
    const stem = await kickSource(songId);
    if (stem.format !== 'wav') throw unprocessable('hits.midi_kick', 'A MIDI kick has no waveform to average. Upload the kick as audio to see it under the tuck.');
    const key = `${stem.id}|${map.updatedAt}`;
    const cached = averages.get(key);
    if (cached) return cached;
    const { info, mono } = await readWavMono(store.pathOf(stem.storageKey));
    const avg = averageKick(mono, info.sampleRate, map.hits.filter((h) => h.enabled).map((h) => h.timeSec));
    averages.set(key, avg);
    if (averages.size > 32) averages.delete(averages.keys().next().value!);
    return avg;
  }

  return { get, detect, edit, kickSource, averageKick: averageKickOf, acknowledge: hits.acknowledge };
}
export type HitsService = ReturnType<typeof createHitsService>;
