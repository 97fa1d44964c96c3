import { stampForLane, RENDER_RAMP_TOLERANCE_DB } from '../engine/engine.service';
import type { z } from 'zod';
import type { laneCreateSchema, LaneDto, LanePatch } from '../../shared/schemas/lane';
import type { PresetsRepository } from '../presets/presets.repository';
import type { HitsService } from '../hits/hits.service';
import { unprocessable } from '../http/errors';
import type { StemsRepository } from '../stems/stems.repository';
import type { StemsService } from '../stems/stems.service';
import { toLaneDto, type LaneRow, type LanesRepository } from './lanes.repository';

export function createLanesService(deps: { lanes: LanesRepository; hits: HitsService; stems: StemsService; stemsRepo: StemsRepository; presets?: PresetsRepository }) {
  const { lanes, hits, stems, stemsRepo } = deps;

  /** Adds the preset's current version, so the client can say when a newer one exists. */
  async function withPresetVersion(songId: string, teamId: string | undefined, dtos: LaneDto[]): Promise<LaneDto[]> {
    if (!teamId || !deps.presets) return dtos;
    const out: LaneDto[] = [];
    for (const d of dtos) {
      if (!d.presetId) {
        out.push(d);
        continue;
      }
      const latest = await deps.presets.get(teamId, d.presetId).catch(() => undefined);
      out.push({ ...d, presetLatestVersion: latest?.version ?? null, presetName: latest?.name ?? null });
    }
    return out;
  }

  async function checkSlot(songId: string, slot: string | null | undefined) {
    if (!slot) return;
    const stem = await stemsRepo.current(songId, slot);
    if (!stem) throw unprocessable('lanes.no_such_stem', `This song has no stem "${slot}". Upload it first or pick another.`);
    if (stem.format !== 'wav') throw unprocessable('lanes.stem_not_audio', `The stem "${slot}" is MIDI; a lane ducks an audio stem.`);
  }

  /** The song's length: its longest current stem, else one second past the last hit. */
  async function songDurationSec(songId: string, lastHitSec: number): Promise<number> {
    const all = await stemsRepo.list(songId);
    const longest = all.filter((s) => s.isCurrent).reduce((m, s) => Math.max(m, s.durationSec), 0);
    return longest || lastHitSec + 1;
  }

  /**
   * Stamps one lane over the song's hit map with the same shared code the
   * browser runs; `forRender` samples the ramps finely enough to multiply audio by.
   */
  async function stamp(songId: string, row: LaneRow, forRender = false) {
    const map = await hits.get(songId);
    const lane = toLaneDto(row);
    const durationSec = await songDurationSec(songId, map.hits.at(-1)?.timeSec ?? 0);
    const bass = lane.bassSlot ? await stemsRepo.current(songId, lane.bassSlot) : undefined;
    const bassActivity = lane.gateEnabled && bass?.format === 'wav' ? await stems.activity(songId, bass.id) : undefined;
    const result = stampForLane(
      map.hits,
      { name: lane.name, shape: lane.shape, baseGainDb: lane.baseGainDb, gate: { enabled: lane.gateEnabled, thresholdDbfs: lane.gateThresholdDbfs } },
      { durationSec, bassActivity, rampToleranceDb: forRender ? RENDER_RAMP_TOLERANCE_DB : undefined },
    );
    return { lane, map, bass, bassActivity, durationSec, result };
  }

  return {
    stamp,
    songDurationSec,
    async list(songId: string, teamId?: string) {
      return withPresetVersion(songId, teamId, (await lanes.list(songId)).map(toLaneDto));
    },
    async get(songId: string, laneId: string, teamId?: string) {
      return (await withPresetVersion(songId, teamId, [toLaneDto(await lanes.get(songId, laneId))]))[0];
    },
    /** Copies a published preset's shape and gate threshold onto a lane, remembering which version it came from. */
    async applyPreset(teamId: string, songId: string, laneId: string, presetId: string, mayUseDrafts: boolean) {
      if (!deps.presets) throw new Error('presets repository not wired');
      const preset = await deps.presets.get(teamId, presetId);
      if (preset.status === 'retired' || (!mayUseDrafts && preset.status !== 'published')) {
        throw unprocessable('presets.not_published', 'Only published presets can be applied. Ask an engineer to publish it.');
      }
      await lanes.get(songId, laneId);
      const row = await lanes.update(songId, laneId, { shape: preset.shape, gateThresholdDbfs: preset.gateThresholdDbfs, presetId: preset.id, presetVersion: preset.version });
      await deps.presets.countUse(preset.id);
      return (await withPresetVersion(songId, teamId, [toLaneDto(row)]))[0];
    },
    async create(songId: string, input: z.output<typeof laneCreateSchema>) {
      await checkSlot(songId, input.bassSlot);
      return toLaneDto(await lanes.create(songId, input));
    },
    async update(songId: string, laneId: string, patch: LanePatch) {
      const { revision, ...values } = patch;
      if (values.bassSlot !== undefined) await checkSlot(songId, values.bassSlot);
      return toLaneDto(await lanes.update(songId, laneId, values, revision));
    },
    remove: lanes.remove,
    async curve(songId: string, laneId: string) {
      const { result, durationSec, map } = await stamp(songId, await lanes.get(songId, laneId));
      return {
        durationSec,
        hitMapUpdatedAt: map.updatedAt,
        points: result.curve.points,
        baseGainDb: result.curve.baseGainDb,
        floorDb: result.curve.floorDb,
        gatedHitIds: result.gatedHitIndexes.map((i) => map.hits[i].id),
        stampedHitCount: result.stampedHitCount,
      };
    },
  };
}
export type LanesService = ReturnType<typeof createLanesService>;
