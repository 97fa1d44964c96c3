import { applyGains, levelFigures, sumStems, windowPeakDbfs } from '../../shared/dsp/headroom';
import { phaseCheck } from '../../shared/dsp/phase-check';
import { sampleGainCurve } from '../../shared/dsp/gain';
import type { HeadroomReportDto } from '../../shared/schemas/report';
import { readWavFile } from '../audio/wav-file';
import type { HitsService } from '../hits/hits.service';
import { unprocessable } from '../http/errors';
import type { LanesService } from '../lanes/lanes.service';
import { createLanesRepository } from '../lanes/lanes.repository';
import type { FileStore } from '../storage/file-store';

/** Per-hit window of the report: from 5 ms before the hit to 80 ms after, where kick and bass peaks meet (our choice). */
const HIT_WINDOW = { beforeSec: 0.005, afterSec: 0.08 };

function mono(channels: readonly Float32Array[]): Float32Array {
  if (channels.length === 1) return channels[0];
  const out = new Float32Array(channels[0].length);
  for (const ch of channels) for (let i = 0; i < ch.length; i++) out[i] += ch[i] / channels.length;
  return out;
}

export function createReportService(deps: { hits: HitsService; lanes: LanesService; lanesRepo: ReturnType<typeof createLanesRepository>; store: FileStore }) {
  const { hits, lanes, lanesRepo, store } = deps;
  const cache = new Map<string, HeadroomReportDto>();

  return {
    /** The headroom report of a song: every figure before and after the tucks (cached until an input changes). */
    async report(songId: string): Promise<HeadroomReportDto> {
      const kickStem = await hits.kickSource(songId);
      if (kickStem.format !== 'wav') throw unprocessable('report.needs_audio_kick', 'The headroom report measures audio: upload the kick as a WAV stem (a MIDI kick has no sound to measure).');
      const laneRows = (await lanesRepo.list(songId)).filter((l) => !l.muted && l.bassSlot);
      if (!laneRows.length) throw unprocessable('report.no_lanes', 'Add a lane with a bass stem first: the report compares kick plus bass before and after the tucks.');
      const stamped = [];
      for (const row of laneRows) stamped.push(await lanes.stamp(songId, row, true));
      const usable = stamped.filter((s) => s.bass?.format === 'wav');
      if (!usable.length) throw unprocessable('report.no_bass_audio', 'None of the lanes has an audio bass stem to measure.');
      const map = usable[0].map;
      const key = [kickStem.id, map.updatedAt, ...usable.map((s) => `${s.lane.id}:${s.lane.revision}:${s.bass!.id}`)].join('|');
      const cached = cache.get(key);
      if (cached) return cached;

      const kick = await readWavFile(store.pathOf(kickStem.storageKey));
      const fs = kick.info.sampleRate;
      const laneData = [];
      for (const s of usable) {
        const bass = await readWavFile(store.pathOf(s.bass!.storageKey));
        if (bass.info.sampleRate !== fs) {
          throw unprocessable('report.rate_mismatch', `The kick is at ${fs} Hz but "${s.bass!.originalName}" is at ${bass.info.sampleRate} Hz. Export both stems at one sample rate.`);
        }
        const gains = sampleGainCurve(s.result.curve, bass.info.frames, fs);
        laneData.push({ s, before: bass.channels, after: applyGains(bass.channels, gains) });
      }
      const sumBefore = sumStems([kick.channels, ...laneData.map((l) => l.before)]);
      const sumAfter = sumStems([kick.channels, ...laneData.map((l) => l.after)]);
      const before = levelFigures(sumBefore, fs);
      const after = levelFigures(sumAfter, fs);
      const enabledHits = map.hits.filter((h) => h.enabled);
      const first = laneData[0];
      const phase = phaseCheck(mono(kick.channels), mono(first.before), fs, enabledHits.map((h) => h.timeSec));

      const report: HeadroomReportDto = {
        songId,
        sampleRateHz: fs,
        durationSec: kick.info.durationSec,
        lanes: laneData.map((l) => ({ laneId: l.s.lane.id, name: l.s.lane.name, before: levelFigures(l.before, fs), after: levelFigures(l.after, fs) })),
        sum: { before, after },
        headroomGainedDb: { samplePeak: before.samplePeakDbfs - after.samplePeakDbfs, truePeak: before.truePeakDbtp - after.truePeakDbtp },
        perHit: enabledHits.map((h) => ({
          hitId: h.id,
          timeSec: h.timeSec,
          beforeDbfs: windowPeakDbfs(sumBefore, fs, h.timeSec - HIT_WINDOW.beforeSec, h.timeSec + HIT_WINDOW.afterSec),
          afterDbfs: windowPeakDbfs(sumAfter, fs, h.timeSec - HIT_WINDOW.beforeSec, h.timeSec + HIT_WINDOW.afterSec),
        })),
        phase: { laneId: first.s.lane.id, hits: phase.hits.map((p, i) => ({ ...p, hitId: enabledHits[i].id })), suggestion: phase.suggestion },
        computedAt: new Date().toISOString(),
      };
      cache.set(key, report);
      if (cache.size > 16) cache.delete(cache.keys().next().value!);
      return report;
    },
  };
}
export type ReportService = ReturnType<typeof createReportService>;
