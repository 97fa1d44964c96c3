import type { GainCurve } from './gain-curve';
import { sampleGainCurve } from './gain';
import { mixdownInto } from './mixdown';
import { applyGains, levelFigures, sumStems, windowPeakDbfs, type LevelFigures } from './headroom';
import { phaseCheck, type HitPhase, type PhaseSuggestion } from './phase-check';

/** Per-hit window of the report: from 5 ms before the hit to 80 ms after, where kick and bass peaks meet (our choice). */
export const HIT_WINDOW = { beforeSec: 0.005, afterSec: 0.08 };

export interface HeadroomInput {
  sampleRateHz: number;
  kick: readonly Float32Array[];
  lanes: { id: string; name: string; bass: readonly Float32Array[]; curve: GainCurve }[];
  /** Enabled hits, ascending. */
  hits: readonly { id: string; timeSec: number }[];
}

export interface HeadroomResult {
  lanes: { laneId: string; name: string; before: LevelFigures; after: LevelFigures }[];
  sum: { before: LevelFigures; after: LevelFigures };
  headroomGainedDb: { samplePeak: number; truePeak: number };
  perHit: { hitId: string; timeSec: number; beforeDbfs: number; afterDbfs: number }[];
  phase: { laneId: string; hits: (HitPhase & { hitId: string })[]; suggestion: PhaseSuggestion } | null;
}

/** The mean of the channels (shared/dsp/mixdown.ts); a mono stem is used as it is. */
function mono(channels: readonly Float32Array[]): Float32Array {
  if (channels.length === 1) return channels[0];
  const out = new Float32Array(channels[0].length);
  mixdownInto(channels, out);
  return out;
}

/**
 * The headroom report (GLOSSARY "Headroom report"): each lane's bass and the
 * sum of kick plus every lane, before and after multiplying the bass by its
 * gain curve — sample peak, true peak, integrated and maximum short-term
 * loudness — the peak of the sum around each hit, and the phase check of the
 * first lane. Headroom gained = figure before − figure after (dB).
 */
export function computeHeadroomReport(input: HeadroomInput): HeadroomResult {
  const fs = input.sampleRateHz;
  const lanes = input.lanes.map((l) => {
    const gains = sampleGainCurve(l.curve, l.bass[0]?.length ?? 0, fs);
    return { ...l, after: applyGains(l.bass, gains) };
  });
  const sumBefore = sumStems([input.kick, ...lanes.map((l) => l.bass)]);
  const sumAfter = sumStems([input.kick, ...lanes.map((l) => l.after)]);
  const before = levelFigures(sumBefore, fs);
  const after = levelFigures(sumAfter, fs);
  const first = lanes[0];
  const phase = first ? phaseCheck(mono(input.kick), mono(first.bass), fs, input.hits.map((h) => h.timeSec)) : null;
  return {
    lanes: lanes.map((l) => ({ laneId: l.id, name: l.name, before: levelFigures(l.bass, fs), after: levelFigures(l.after, fs) })),
    sum: { before, after },
    headroomGainedDb: { samplePeak: before.samplePeakDbfs - after.samplePeakDbfs, truePeak: before.truePeakDbtp - after.truePeakDbtp },
    perHit: input.hits.map((h) => ({
      hitId: h.id,
      timeSec: h.timeSec,
      beforeDbfs: windowPeakDbfs(sumBefore, fs, h.timeSec - HIT_WINDOW.beforeSec, h.timeSec + HIT_WINDOW.afterSec),
      afterDbfs: windowPeakDbfs(sumAfter, fs, h.timeSec - HIT_WINDOW.beforeSec, h.timeSec + HIT_WINDOW.afterSec),
    })),
    phase: first && phase ? { laneId: first.id, hits: phase.hits.map((p, i) => ({ ...p, hitId: input.hits[i].id })), suggestion: phase.suggestion } : null,
  };
}
