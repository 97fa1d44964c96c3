import type { LowBand } from './low-band';

/**
 * Measurements that tell a kick from what else makes the low band move
 * (a snare's body leaking through the filter, a ringing tail beating).
 * Energies are mean squares (linear, full scale²); ratios in dB = 10·log10.
 * Our measures, tuned on the synthetic stems of test/reference; no source.
 */

function meanSquare(x: Float32Array, from: number, to: number): number {
  const lo = Math.max(0, from);
  const hi = Math.min(x.length, to);
  let e = 0;
  for (let i = lo; i < hi; i++) e += x[i]! * x[i]!;
  return hi > lo ? e / (hi - lo) : 0;
}

const TINY = 1e-12;

/** Window of newHighBandDb on each side of the onset, seconds. */
export const NEW_HIGH_WINDOW_SEC = 0.03;

/**
 * Sustain: low-band energy 15–55 ms after the onset over the 10 ms before it,
 * dB. A kick's body lasts; a snare's leak into the low band is gone within
 * ~15 ms, so on a decaying tail its sustain is negative.
 * @param band low band (shared/dsp/low-band.ts)
 * @param atLowSample onset as an index into band.samples
 */
export function sustainDb(band: LowBand, atLowSample: number): number {
  const r = band.rateHz;
  const before = meanSquare(band.samples, atLowSample - Math.round(0.01 * r), atLowSample);
  const after = meanSquare(band.samples, atLowSample + Math.round(0.015 * r), atLowSample + Math.round(0.055 * r));
  return 10 * Math.log10((after + TINY) / (before + TINY));
}

/**
 * New high-band energy at a hit against its low-band energy, dB:
 * ΔE_high = E_high[0, 30 ms) − E_high[−30, 0 ms) with E_high = E_full − E_low,
 * over E_low[0, 30 ms). A snare or clap on a ringing kick tail brings much
 * new energy above the band and little in it; a kick the reverse.
 * @param mono full-rate signal, linear, from sample `monoStart` of the song on
 * @param band its low band (the whole song's)
 * @param atSample onset, full-rate sample index of the song
 */
export function newHighBandDb(mono: Float32Array, monoStart: number, band: LowBand, atSample: number, sampleRateHz: number): number {
  const w = Math.round(NEW_HIGH_WINDOW_SEC * sampleRateHz);
  const low = (a: number, b: number): number => meanSquare(band.samples, Math.floor(a / band.factor), Math.floor(b / band.factor));
  const lowAfter = low(atSample, atSample + w);
  const m = atSample - monoStart;
  const highAfter = Math.max(0, meanSquare(mono, m, m + w) - lowAfter);
  const highBefore = Math.max(0, meanSquare(mono, m - w, m) - low(atSample - w, atSample));
  return 10 * Math.log10((Math.max(0, highAfter - highBefore) + TINY) / (lowAfter + TINY));
}

/**
 * Energy jump at a sample: full-band energy of the `windowSec` after over
 * the `windowSec` before, dB. Short windows (5 ms) favour the sample where
 * the hit's first energy arrives over one a few ms into its body.
 */
export function energyJumpDb(x: Float32Array, atSample: number, sampleRateHz: number, windowSec = 0.005): number {
  const w = Math.round(windowSec * sampleRateHz);
  return 10 * Math.log10((meanSquare(x, atSample, atSample + w) + TINY) / (meanSquare(x, atSample - w, atSample) + TINY));
}
