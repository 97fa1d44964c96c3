import type { HeadroomReportDto } from '../../shared/schemas/report';
import { readWavFile } from '../audio/wav-file';
import type { HitsService } from '../hits/hits.service';
import { unprocessable } from '../http/errors';
import type { LanesService } from '../lanes/lanes.service';
import { createLanesRepository } from '../lanes/lanes.repository';
import type { FileStore } from '../storage/file-store';
import { createReportComputer } from './report-compute';

export function createReportService(deps: { hits: HitsService; lanes: LanesService; lanesRepo: ReturnType<typeof createLanesRepository>; store: FileStore }) {
  const { hits, lanes, lanesRepo, store } = deps;
  const cache = new Map<string, HeadroomReportDto>();
  // The measuring worker starts now, so the first report does not wait for it.
  const computer = createReportComputer();

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
      const laneInputs = [];
      for (const s of usable) {
        const bass = await readWavFile(store.pathOf(s.bass!.storageKey));
        if (bass.info.sampleRate !== fs) {
          throw unprocessable('report.rate_mismatch', `The kick is at ${fs} Hz but "${s.bass!.originalName}" is at ${bass.info.sampleRate} Hz. Export both stems at one sample rate.`);
        }
        laneInputs.push({ id: s.lane.id, name: s.lane.name, bass: bass.channels, curve: s.result.curve });
      }
      const result = await computer.compute({ sampleRateHz: fs, kick: kick.channels, lanes: laneInputs, hits: map.hits.filter((h) => h.enabled) });
      const report: HeadroomReportDto = { songId, sampleRateHz: fs, durationSec: kick.info.durationSec, ...result, computedAt: new Date().toISOString() };
      cache.set(key, report);
      if (cache.size > 16) cache.delete(cache.keys().next().value!);
      return report;
    },
  };
}
export type ReportService = ReturnType<typeof createReportService>;
