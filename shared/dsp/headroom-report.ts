import type { GainCurve } from './gain-curve';
import { sampleGainCurve } from './gain';
import { mixdownInto } from './mixdown';
import { applyGains, levelFigures, sumStems, sumStemsInto, windowPeakDbfs, type LevelFigures } from './headroom';
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

/**
 * Full-length buffers that are free again, handed out before fresh ones: on
 * this machine a fresh 5-minute channel (58 MB) costs about 50 ms of page
 * faults, more than most passes over it. Contents are left as they are.
 */
function bufferPool(free: Float32Array[]) {
  return (frames: number): Float32Array => {
    const i = free.findIndex((b) => b.length >= frames);
    return i < 0 ? new Float32Array(frames) : free.splice(i, 1)[0].subarray(0, frames);
  };
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
    return { ...l, gains, after: applyGains(l.bass, gains) };
  });
  const hitPeaks = (bus: readonly Float32Array[]) => input.hits.map((h) => windowPeakDbfs(bus, fs, h.timeSec - HIT_WINDOW.beforeSec, h.timeSec + HIT_WINDOW.afterSec));
  // One bus, summed before the tucks and measured, then summed again after them into the same buffers.
  const bus = sumStems([input.kick, ...lanes.map((l) => l.bass)]);
  const before = levelFigures(bus, fs);
  const perHitBefore = hitPeaks(bus);
  sumStemsInto([input.kick, ...lanes.map((l) => l.after)], bus);
  const after = levelFigures(bus, fs);
  const perHitAfter = hitPeaks(bus);

  // The phase check's mono kick and low bands go into the bus and gain buffers, measured and done with.
  const buffer = bufferPool([...bus, ...lanes.map((l) => l.gains)]);
  const first = lanes[0];
  let phase: ReturnType<typeof phaseCheck> | null = null;
  if (first) {
    const kick = input.kick.length === 1 ? input.kick[0] : buffer(input.kick[0]?.length ?? 0);
    if (kick !== input.kick[0]) mixdownInto(input.kick, kick);
    const bass = first.bass.length === 1 ? first.bass[0] : buffer(first.bass[0]?.length ?? 0);
    if (bass !== first.bass[0]) mixdownInto(first.bass, bass);
    // A mixdown made here is filtered in place; a stem passed in is left untouched.
    const lowBands: [Float32Array, Float32Array] = [kick === input.kick[0] ? buffer(kick.length) : kick, bass === first.bass[0] ? buffer(bass.length) : bass];
    phase = phaseCheck(kick, bass, fs, input.hits.map((h) => h.timeSec), {}, lowBands);
  }
  return {
    lanes: lanes.map((l) => ({ laneId: l.id, name: l.name, before: levelFigures(l.bass, fs), after: levelFigures(l.after, fs) })),
    sum: { before, after },
    headroomGainedDb: { samplePeak: before.samplePeakDbfs - after.samplePeakDbfs, truePeak: before.truePeakDbtp - after.truePeakDbtp },
    perHit: input.hits.map((h, i) => ({ hitId: h.id, timeSec: h.timeSec, beforeDbfs: perHitBefore[i], afterDbfs: perHitAfter[i] })),
    phase: first && phase ? { laneId: first.id, hits: phase.hits.map((p, i) => ({ ...p, hitId: input.hits[i].id })), suggestion: phase.suggestion } : null,
  };
}
