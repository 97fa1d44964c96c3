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

/** Figures of one bus and its sample peak around each hit (dBFS, HIT_WINDOW). */
export interface BusMeasurement {
  figures: LevelFigures;
  hitPeaksDbfs: number[];
}

/** Level figures of a bus and its peak in each hit's window, hits given by time (s). */
export function measureBus(bus: readonly Float32Array[], sampleRateHz: number, hitTimesSec: readonly number[]): BusMeasurement {
  return {
    figures: levelFigures(bus, sampleRateHz),
    hitPeaksDbfs: hitTimesSec.map((t) => windowPeakDbfs(bus, sampleRateHz, t - HIT_WINDOW.beforeSec, t + HIT_WINDOW.afterSec)),
  };
}

/**
 * Each lane's bass after its tucks: bass × the sampled gain curve, in buffers
 * from `buffer`. The gains are sampled into the last channel's buffer and
 * multiplied in place there (applyGains does that channel last), which saves
 * a full-length temporary per lane.
 */
export function tuckedLanes(input: HeadroomInput, buffer: (frames: number) => Float32Array = (frames) => new Float32Array(frames)): Float32Array[][] {
  return input.lanes.map((l) => {
    const frames = l.bass[0]?.length ?? 0;
    const gains = sampleGainCurve(l.curve, frames, input.sampleRateHz, buffer(frames));
    const last = l.bass.length - 1;
    return applyGains(l.bass, gains, l.bass.map((ch, c) => (c === last && ch.length === frames ? gains : buffer(ch.length))));
  });
}

/**
 * The phase check of the first lane (null without lanes) on the mono mix of
 * the kick and of its bass (shared/dsp/mixdown.ts; a mono stem as it is).
 * `buffer` supplies full-length scratch buffers; the stems are left untouched.
 */
export function firstLanePhase(input: HeadroomInput, buffer: (frames: number) => Float32Array = (frames) => new Float32Array(frames)): HeadroomResult['phase'] {
  const first = input.lanes[0];
  if (!first) return null;
  const monoOf = (channels: readonly Float32Array[]) => {
    if (channels.length === 1) return { mono: channels[0], own: false };
    const mono = buffer(channels[0]?.length ?? 0);
    mixdownInto(channels, mono);
    return { mono, own: true };
  };
  const kick = monoOf(input.kick);
  const bass = monoOf(first.bass);
  // A mixdown made here is filtered in place; a stem passed in is not.
  const lowBands: [Float32Array, Float32Array] = [kick.own ? kick.mono : buffer(kick.mono.length), bass.own ? bass.mono : buffer(bass.mono.length)];
  return phaseOfMonos(first.id, input.hits, input.sampleRateHz, kick.mono, bass.mono, lowBands);
}

/**
 * The report's phase entry for one lane from the mono kick and bass
 * (shared/dsp/phase-check.ts), the low bands written to `lowBands` (the monos
 * themselves when they may be overwritten).
 */
function phaseOfMonos(
  laneId: string,
  hits: HeadroomInput['hits'],
  sampleRateHz: number,
  kickMono: Float32Array,
  bassMono: Float32Array,
  lowBands: [Float32Array, Float32Array],
): NonNullable<HeadroomResult['phase']> {
  const phase = phaseCheck(kickMono, bassMono, sampleRateHz, hits.map((h) => h.timeSec), {}, lowBands);
  return { laneId, hits: phase.hits.map((p, i) => ({ ...p, hitId: hits[i].id })), suggestion: phase.suggestion };
}

/** The report from its measured parts (headroom gained = figure before − figure after, dB). */
export function assembleHeadroomResult(
  input: HeadroomInput,
  parts: { lanes: { before: LevelFigures; after: LevelFigures }[]; before: BusMeasurement; after: BusMeasurement; phase: HeadroomResult['phase'] },
): HeadroomResult {
  const { before, after } = parts;
  return {
    lanes: input.lanes.map((l, i) => ({ laneId: l.id, name: l.name, before: parts.lanes[i].before, after: parts.lanes[i].after })),
    sum: { before: before.figures, after: after.figures },
    headroomGainedDb: {
      samplePeak: before.figures.samplePeakDbfs - after.figures.samplePeakDbfs,
      truePeak: before.figures.truePeakDbtp - after.figures.truePeakDbtp,
    },
    perHit: input.hits.map((h, i) => ({ hitId: h.id, timeSec: h.timeSec, beforeDbfs: before.hitPeaksDbfs[i], afterDbfs: after.hitPeaksDbfs[i] })),
    phase: parts.phase,
  };
}

/**
 * Full-length buffers that are free again, handed out before fresh ones: on
 * this machine a fresh 5-minute channel (58 MB) costs about 50 ms of page
 * faults, more than most passes over it. Contents are left as they are.
 */
export function bufferPool(free: Float32Array[]) {
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
 * In one thread; server/report/ runs the same steps on two.
 */
export function computeHeadroomReport(input: HeadroomInput): HeadroomResult {
  const fs = input.sampleRateHz;
  const hitTimes = input.hits.map((h) => h.timeSec);
  const afters = tuckedLanes(input);
  // One bus, summed before the tucks and measured, then summed again after them into the same buffers.
  const bus = sumStems([input.kick, ...input.lanes.map((l) => l.bass)]);
  const before = measureBus(bus, fs, hitTimes);
  sumStemsInto([input.kick, ...afters], bus);
  const after = measureBus(bus, fs, hitTimes);
  // The phase check's mono mixes and low bands go into the bus buffers, measured and done with.
  const phase = firstLanePhase(input, bufferPool(bus));
  const lanes = input.lanes.map((l, i) => ({ before: levelFigures(l.bass, fs), after: levelFigures(afters[i], fs) }));
  return assembleHeadroomResult(input, { lanes, before, after, phase });
}
