import type { DetectionOptions, Hit } from '../schemas/hit';
import { withDetectionDefaults } from '../schemas/hit-defaults';
import { lowBandOf, type LowBand } from './low-band';
import { predictionOnsetFunction, type PredictionOnsetFunction } from './onset-function';
import { pickPeaks } from './peak-pick';
import { arAicChangePoint, REFINE_PAD_SEC, refineOnsetSample } from './onset-refine';
import { energyJumpDb, NEW_HIGH_WINDOW_SEC, newHighBandDb, sustainDb } from './hit-evidence';

/** Knobs the sensitivity sets, derived in one place so the docs can quote them. */
export interface DetectionThresholds {
  /** δ: least rise of the low band's prediction error counted as a candidate, dB. */
  minRiseDb: number;
  /** A hit's new low-band energy must be within this many dB of a typical loud hit's. */
  floorBelowLoudestDb: number;
}

/**
 * sensitivity s ∈ [0, 1] → δ = 16 − 12·s dB and floor = 15 + 30·s dB
 * (s = 0.5: 10 dB and 30 dB; ghost notes 20 dB down pass). Our choice,
 * tuned on the synthetic stems of test/reference; no source.
 */
export function detectionThresholds(sensitivity: number): DetectionThresholds {
  return { minRiseDb: 16 - 12 * sensitivity, floorBelowLoudestDb: 15 + 30 * sensitivity };
}

/**
 * Every fixed constant of the detector, seconds and dB. Our choices, tuned on
 * the synthetic stems of test/reference (no source) unless noted.
 */
export const DETECTION_TUNING = {
  /** Onset-function grid and windows (shared/dsp/onset-function.ts). */
  hopSec: 0.001,
  fitSec: 0.02,
  scoreSec: 0.01,
  /** λ of the moving-median threshold δ + λ·median (Bello et al. 2005 §IV-B). */
  medianWeight: 1,
  medianRadiusSec: 0.1,
  /** Local-maximum half-width: under half a 1/32 note at 150 BPM (50 ms). */
  peakRadiusSec: 0.01,
  /** Coarse peaks closer than minGap − this are merged before refinement. */
  coarseGapToleranceSec: 0.008,
  /** Refined onsets closer than minGap − this are merged (timing jitter). */
  gapToleranceSec: 0.002,
  /** Innovation of a peak: the largest in the 10 ms after it. */
  innovationReachSec: 0.01,
  /** Reference level for the floor: this quantile of the candidates' innovations. */
  referenceQuantile: 0.75,
  /** Refinement search window around the coarse frame. */
  refineBeforeSec: 0.03,
  refineAfterSec: 0.012,
  /** Full-rate AR-AIC: predictor order and ridge. */
  refineOrder: 8,
  refineRidge: 1e-3,
  /** The 4 kHz picker is considered only when it disagrees with the full-rate one by this much… */
  disagreeSec: 0.007,
  /** …and then is searched ± this at full rate; a later alternative must raise the energy jump by this much. */
  fineSec: 0.003,
  laterMarginDb: 0,
  /** Window of the energy jump that arbitrates between the two pickers. */
  jumpSec: 0.005,
  /** Kick evidence: sustained new low energy, or a tail hit with nothing new above the band. */
  minSustainDb: 4,
  tailMinSustainDb: -3,
  tailMaxHighDb: 3,
  tailMinInnovationDb: -7,
  /** …or sustains moderately (≥ 2 dB) with a prediction error within 10 dB. */
  midMinSustainDb: 2,
  midMinInnovationDb: -10,
  /** Span after the onset over which a hit's low-band peak (its strength) is measured. */
  strengthSpanSec: 0.04,
  /** Absolute floor: a hit whose low-band peak stays under −45 dBFS is noise, not a kick worth tucking. */
  minLowPeakDbfs: -45,
};
export type DetectionTuning = typeof DETECTION_TUNING;

/**
 * Finds every kick onset in a mono signal.
 *
 * 1. Low band: anti-alias, decimate to ~2 kHz, 8th-order Butterworth
 *    low-pass at `lowBandHz` (shared/dsp/low-band.ts).
 * 2. Onset function: rise of the low band's linear-prediction error, dB, on
 *    a 1 ms grid (shared/dsp/onset-function.ts; Bello et al. 2005 §III).
 * 3. Candidates: local maxima over ±10 ms above δ + λ·median(±100 ms)
 *    (shared/dsp/peak-pick.ts; Bello et al. 2005 §IV-B, Dixon 2006) whose
 *    new low-band energy (prediction error) is within `floorBelowLoudestDb`
 *    of a typical loud hit's.
 * 4. Refinement to the sample where the hit's energy begins — a tuck placed
 *    at the energy peak would be late: AR-AIC on the full-rate signal, checked
 *    against a 4 kHz free-running AR-AIC (shared/dsp/onset-refine.ts).
 * 5. Kick evidence (shared/dsp/hit-evidence.ts): the low band must sustain
 *    (≥ 4 dB more energy 15–55 ms after than in the 10 ms before), or — for
 *    hits on a ringing tail — bring little new energy above the band (< +3 dB
 *    over its low-band energy) and either fall by at most 3 dB with a
 *    prediction error within 7 dB of a typical loud hit's, or sustain ≥ 2 dB
 *    with one within 10 dB. Snares, claps and hats fail all three.
 * 6. Minimum gap: of two hits closer than `minGapMs` (less 2 ms of jitter)
 *    the one with the larger rise stays.
 *
 * A hit whose low-band peak stays under −45 dBFS is dropped (noise).
 * strength = peak |low band| in the 40 ms after the onset ÷ the largest such
 * peak (linear amplitude ratio, 0..1; a ghost note 20 dB down ≈ 0.1).
 * @param mono mono signal, linear full scale ±1
 * @param sampleRateHz sample rate in Hz
 * @returns hits sorted by time, `timeSec = sample / sampleRateHz`, all enabled
 */
export function detectOnsets(mono: Float32Array, sampleRateHz: number, options: Partial<DetectionOptions> = {}): Hit[] {
  const opts = withDetectionDefaults(options);
  return detectOnsetsWithLowBand(mono, lowBandOf(mono, sampleRateHz, opts.lowBandHz), sampleRateHz, opts);
}

/** What the detector measured for one candidate, for diagnostics (why a hit was kept or dropped). */
export interface CandidateTrace {
  sample: number;
  riseDb: number;
  innovationDb: number;
  sustainDb: number;
  newHighDb: number;
  kept: boolean;
}

/**
 * detectOnsets with the low band already built (the server's reference path
 * builds it block by block while decoding; shared/dsp/low-band.ts). Same
 * units and steps. `trace` sees every candidate refined, kept or not.
 */
export function detectOnsetsWithLowBand(
  mono: Float32Array,
  band: LowBand,
  sampleRateHz: number,
  opts: DetectionOptions,
  tuning: DetectionTuning = DETECTION_TUNING,
  trace?: (candidate: CandidateTrace) => void,
): Hit[] {
  const g = onsetGeometry(band.rateHz, tuning);
  const odf = predictionOnsetFunction(band.samples, g.hopSamples, g.fitSamples, g.windowSamples);
  const candidates = findCandidates(band, odf, opts, tuning);
  const kept = refineCandidates({ samples: mono, start: 0 }, band, candidates, 0, candidates.length, 0, sampleRateHz, opts, tuning, trace);
  return finishHits(kept, band, sampleRateHz, opts, tuning);
}

/** Hop, fitting window and scoring window of the onset function on a low band at `rateHz`, in low-band samples. */
export function onsetGeometry(rateHz: number, tuning: DetectionTuning = DETECTION_TUNING): { hopSamples: number; fitSamples: number; windowSamples: number } {
  return {
    hopSamples: Math.max(1, Math.round(tuning.hopSec * rateHz)),
    fitSamples: Math.round(tuning.fitSec * rateHz),
    windowSamples: Math.round(tuning.scoreSec * rateHz),
  };
}

/** A coarse onset (step 3) that passed the innovation floor, ready for refinement. */
export interface Candidate {
  /** Onset-function frame of the peak. */
  frame: number;
  /** Full-rate sample of the frame's start. */
  frameSample: number;
  /** riseDb at the peak. */
  rise: number;
  /** innovation / reference, dB. */
  innovationDb: number;
}

/**
 * A stretch of the full-rate mono mixdown: samples[i] is sample start + i
 * of the song. Refinement reads only around the candidates, so a caller may
 * hand it just those windows (server/audio/detection-split.ts refineFromFile).
 */
export interface MonoSpan {
  samples: Float32Array;
  start: number;
}

/** A refined kick onset before the minimum-gap merge (steps 4–5). */
export interface RefinedOnset {
  sample: number;
  rise: number;
}

/** Half-width of the threshold's moving median, onset-function frames. */
export function medianRadiusFrames(rateHz: number, hopSamples: number, tuning: DetectionTuning = DETECTION_TUNING): number {
  return Math.round(tuning.medianRadiusSec / (hopSamples / rateHz));
}

/**
 * Step 3: the coarse peaks of the onset function whose new low-band energy
 * (prediction error) clears the floor set by a typical loud hit's.
 * `median`: movingMedian of odf.riseDb over medianRadiusFrames, when
 * already computed (two threads share it).
 */
export function findCandidates(
  band: LowBand,
  odf: PredictionOnsetFunction,
  opts: DetectionOptions,
  tuning: DetectionTuning = DETECTION_TUNING,
  median?: Float32Array,
): Candidate[] {
  const t = tuning;
  const thresholds = detectionThresholds(opts.sensitivity);
  const hop = odf.hopSamples;
  const hopSec = hop / band.rateHz;
  const radius = medianRadiusFrames(band.rateHz, hop, tuning);
  const peaks = pickPeaks(odf.riseDb, thresholds.minRiseDb, t.medianWeight, radius, Math.max(1, Math.round(t.peakRadiusSec / hopSec)), median);
  if (peaks.length === 0) return [];

  const spaced = mergeClose(peaks, Math.max(0, (opts.minGapMs / 1000 - t.coarseGapToleranceSec) / hopSec), (f) => odf.riseDb[f]!);

  const reachFrames = Math.round(t.innovationReachSec / hopSec);
  const innovation = spaced.map((f) => {
    let max = 0;
    for (let g = f; g < Math.min(odf.innovation.length, f + reachFrames); g++) max = Math.max(max, odf.innovation[g]!);
    return max;
  });
  const sorted = [...innovation].sort((a, b) => a - b);
  const reference = sorted[Math.min(sorted.length - 1, Math.floor(t.referenceQuantile * sorted.length))]!;
  const floor = reference * 10 ** (-thresholds.floorBelowLoudestDb / 10);
  const samplesPerFrame = hop * band.factor;
  const out: Candidate[] = [];
  spaced.forEach((frame, k) => {
    if (innovation[k]! < floor) return;
    out.push({ frame, frameSample: frame * samplesPerFrame, rise: odf.riseDb[frame]!, innovationDb: 10 * Math.log10(innovation[k]! / reference) });
  });
  return out;
}

/**
 * Steps 4–5 for candidates [from, to): refinement to the sample where the
 * energy begins, then the kick evidence. `previousEnd` is one past the last
 * onset kept before `from` (0 at the start): a search never reaches back
 * over it. Candidates far enough from the previous one do not depend on it
 * (independentFrom), which lets two threads refine two halves.
 */
export function refineCandidates(
  span: MonoSpan,
  band: LowBand,
  candidates: readonly Candidate[],
  from: number,
  to: number,
  previousEnd: number,
  sampleRateHz: number,
  opts: DetectionOptions,
  tuning: DetectionTuning = DETECTION_TUNING,
  trace?: (candidate: CandidateTrace) => void,
): RefinedOnset[] {
  const t = tuning;
  const kept: RefinedOnset[] = [];
  const minGapSamples = (opts.minGapMs / 1000 - t.gapToleranceSec) * sampleRateHz;
  const before = Math.round(t.refineBeforeSec * sampleRateHz);
  const after = Math.round(t.refineAfterSec * sampleRateHz);
  const fitSamples = Math.round(t.fitSec * sampleRateHz);
  // Sample indexes below are of the song; mono[i − at] holds sample i. The
  // span must hold refinementReach around every candidate, and then reads
  // the same samples the whole mixdown would.
  const mono = span.samples;
  const at = span.start;
  for (let k = from; k < to; k++) {
    const { frame, frameSample, rise, innovationDb } = candidates[k]!;
    const start = Math.max(previousEnd, frameSample - before);
    const end = Math.min(at + mono.length, frameSample + after);
    let sample = at + arAicChangePoint(mono, start - at, end - at, fitSamples, t.refineOrder, t.refineRidge);
    // The full-rate picker can lock onto a later broadband event (a room's
    // tail) when a low, soft kick starts under noise; the 4 kHz picker sees
    // the body. Take it when it is clearly earlier, keeps the minimum gap and
    // the energy jumps more there.
    const robust = at + refineOnsetSample(mono, sampleRateHz, start - at, end - at, t.fitSec);
    const disagree = Math.abs(sample - robust) > t.disagreeSec * sampleRateHz;
    if (disagree && robust - previousEnd >= minGapSamples) {
      const half = Math.round(t.fineSec * sampleRateHz);
      const fine = at + arAicChangePoint(mono, Math.max(start, robust - half) - at, Math.min(end, robust + half) - at, fitSamples, t.refineOrder, t.refineRidge);
      // Earlier is safer for a tuck, so a later alternative may be asked to win clearly.
      const margin = fine < sample ? 0 : t.laterMarginDb;
      if (energyJumpDb(mono, fine - at, sampleRateHz, t.jumpSec) > energyJumpDb(mono, sample - at, sampleRateHz, t.jumpSec) + margin) sample = fine;
    }
    if (lowBandPeak(band, sample, t.strengthSpanSec) < 10 ** (t.minLowPeakDbfs / 20)) continue;
    const sustain = sustainDb(band, Math.floor(sample / band.factor));
    const newHigh = sustain >= t.minSustainDb ? -Infinity : newHighBandDb(mono, at, band, sample, sampleRateHz);
    const isKick =
      sustain >= t.minSustainDb ||
      (newHigh < t.tailMaxHighDb &&
        ((sustain >= t.tailMinSustainDb && innovationDb >= t.tailMinInnovationDb) || (sustain >= t.midMinSustainDb && innovationDb >= t.midMinInnovationDb)));
    trace?.({ sample, riseDb: rise, innovationDb, sustainDb: sustain, newHighDb: newHigh, kept: isKick });
    if (!isKick) continue;
    kept.push({ sample, rise });
    previousEnd = sample + 1;
  }
  return kept;
}

/**
 * How far refineCandidates reads the full-rate signal around a candidate's
 * frame, in samples: the search window (refineBefore…refineAfter), before it
 * the predictor's fit (fitSec and its order) or the 4 kHz picker's fit and
 * pad, and around any answer the energy jump and the new-high-band windows.
 * Plus 2 ms, for the predictors' lags (twice the order, 16 samples) and
 * rounding. A caller may decode only these windows
 * (server/audio/detection-split.ts refineFromFile).
 */
export function refinementReach(sampleRateHz: number, tuning: DetectionTuning = DETECTION_TUNING): { before: number; after: number } {
  const t = tuning;
  const around = Math.max(t.jumpSec, NEW_HIGH_WINDOW_SEC, REFINE_PAD_SEC);
  const margin = 0.002;
  return {
    before: Math.ceil((t.refineBeforeSec + Math.max(t.fitSec + REFINE_PAD_SEC, around) + margin) * sampleRateHz),
    after: Math.ceil((t.refineAfterSec + around + margin) * sampleRateHz),
  };
}

/**
 * Whether candidate k's refinement cannot depend on what was kept before it:
 * the previous candidate is so far back that an onset kept there (at most
 * `refineAfterSec` after its frame) ends before k's search window and a
 * minimum gap before its earliest answer. Refining from k with
 * previousEnd = 0 then gives what the sequential pass gives.
 */
export function independentFrom(candidates: readonly Candidate[], k: number, sampleRateHz: number, opts: DetectionOptions, tuning: DetectionTuning = DETECTION_TUNING): boolean {
  if (k <= 0 || k >= candidates.length) return false;
  const t = tuning;
  const lastEnd = candidates[k - 1]!.frameSample + Math.round(t.refineAfterSec * sampleRateHz) + 1;
  const earliest = candidates[k]!.frameSample - Math.round(t.refineBeforeSec * sampleRateHz);
  const minGapSamples = (opts.minGapMs / 1000 - t.gapToleranceSec) * sampleRateHz;
  return earliest >= lastEnd + Math.max(0, minGapSamples);
}

/** Step 6 and strengths: the minimum-gap merge of refined onsets, then each hit's low-band peak over the loudest. */
export function finishHits(kept: readonly RefinedOnset[], band: LowBand, sampleRateHz: number, opts: DetectionOptions, tuning: DetectionTuning = DETECTION_TUNING): Hit[] {
  const t = tuning;
  const minGapSamples = (opts.minGapMs / 1000 - t.gapToleranceSec) * sampleRateHz;
  const hits = mergeClose(kept, minGapSamples, (h) => h.rise, (h) => h.sample);
  const peakAmplitude = hits.map(({ sample }) => lowBandPeak(band, sample, t.strengthSpanSec));
  const maxAmplitude = Math.max(...peakAmplitude, 1e-12);
  return hits.map(({ sample }, i) => ({
    timeSec: sample / sampleRateHz,
    sample,
    strength: Math.min(1, peakAmplitude[i]! / maxAmplitude),
    enabled: true,
  }));
}

/** Peak |low band| (linear) in the `spanSec` after a full-rate sample. */
function lowBandPeak(band: LowBand, sample: number, spanSec: number): number {
  const from = Math.floor(sample / band.factor);
  const to = Math.min(band.samples.length, from + Math.round(spanSec * band.rateHz));
  let max = 0;
  for (let i = from; i < to; i++) max = Math.max(max, Math.abs(band.samples[i]!));
  return max;
}

/** Of items (sorted by position) closer than `gap`, keeps the one with the larger score. */
function mergeClose<T>(items: readonly T[], gap: number, score: (item: T) => number, position: (item: T) => number = (item) => item as unknown as number): T[] {
  const out: T[] = [];
  for (const item of items) {
    const last = out[out.length - 1];
    if (last !== undefined && position(item) - position(last) < gap) {
      if (score(item) > score(last)) out[out.length - 1] = item;
      continue;
    }
    out.push(item);
  }
  return out;
}
