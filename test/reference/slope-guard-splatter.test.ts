/**
 * Requirement 2, by construction: the stamped curve (default slope guard, as
 * the product renders it) applied to a full-scale sine must not click. For each
 * ramp, a 200 ms Hann window centred on it; the energy the gain changes put
 * above 1 kHz must be ≥ 60 dB below the sine's energy in the same window.
 * Method and check values: REFERENCES.md "Gain changes and clicks" (measured at
 * 55 Hz, −40 → 0 dB: abrupt step −36 dB, 5 ms raised cosine ≈ −85 dB).
 */
import { describe, expect, it } from 'vitest';
import { tuckShapeSchema, type TuckShapeInput } from '../../shared/schemas/tuck-shape';
import { guardShape } from '../../shared/dsp/slope-guard';
import { sampleGainCurve } from '../../shared/dsp/gain';
import type { GainCurve } from '../../shared/dsp/gain-curve';
import { RENDER_RAMP_TOLERANCE_DB, stampForLane } from '../../server/engine/engine.service';

const FS = 48_000;
const WINDOW_SEC = 0.2;
const FFT_SIZE = 16_384;

/** In-place iterative radix-2 FFT (Cooley–Tukey, decimation in time). */
function fft(re: Float64Array, im: Float64Array): void {
  const n = re.length;
  for (let i = 1, j = 0; i < n; i++) {
    let bit = n >> 1;
    for (; j & bit; bit >>= 1) j ^= bit;
    j ^= bit;
    if (i < j) {
      [re[i], re[j]] = [re[j], re[i]];
      [im[i], im[j]] = [im[j], im[i]];
    }
  }
  for (let len = 2; len <= n; len <<= 1) {
    const ang = (-2 * Math.PI) / len;
    const wr = Math.cos(ang);
    const wi = Math.sin(ang);
    for (let i = 0; i < n; i += len) {
      let cr = 1;
      let ci = 0;
      for (let k = 0; k < len / 2; k++) {
        const a = i + k;
        const b = a + len / 2;
        const tr = re[b] * cr - im[b] * ci;
        const ti = re[b] * ci + im[b] * cr;
        re[b] = re[a] - tr;
        im[b] = im[a] - ti;
        re[a] += tr;
        im[a] += ti;
        const ncr = cr * wr - ci * wi;
        ci = cr * wi + ci * wr;
        cr = ncr;
      }
    }
  }
}

/** Energy of the Hann-windowed signal above `cutHz`, or in total. */
function windowedEnergy(x: Float64Array, cutHz: number | null): number {
  const re = new Float64Array(FFT_SIZE);
  const im = new Float64Array(FFT_SIZE);
  const n = x.length;
  for (let i = 0; i < n; i++) re[i] = x[i] * (0.5 - 0.5 * Math.cos((2 * Math.PI * i) / (n - 1)));
  fft(re, im);
  let e = 0;
  const first = cutHz === null ? 0 : Math.ceil((cutHz * FFT_SIZE) / FS);
  for (let k = first; k <= FFT_SIZE / 2; k++) e += re[k] * re[k] + im[k] * im[k];
  return e;
}

/** dB of the energy above 1 kHz in the window centred on `centreSec`, relative to the plain sine's. */
function splatterDb(gains: Float32Array, freqHz: number, centreSec: number): number {
  const n = Math.round(WINDOW_SEC * FS);
  const start = Math.round(centreSec * FS) - n / 2;
  const y = new Float64Array(n);
  const s = new Float64Array(n);
  for (let i = 0; i < n; i++) {
    const t = (start + i) / FS;
    s[i] = Math.sin(2 * Math.PI * freqHz * t);
    y[i] = s[i] * gains[start + i];
  }
  return 10 * Math.log10(windowedEnergy(y, 1000) / windowedEnergy(s, null));
}

/** Centres (s) of every changing segment of the guarded shape at each hit. */
function rampCentres(shape: TuckShapeInput, hits: number[], baseGainDb: number): number[] {
  const g = guardShape(tuckShapeSchema.parse(shape), { baseGainDb });
  const centres: number[] = [];
  for (const h of hits) for (let i = 0; i + 1 < g.length; i++) if (g[i].gainDb !== g[i + 1].gainDb) centres.push(h + (g[i].tMs + g[i + 1].tMs) / 2000);
  return centres;
}

const SONG_SEC = 3;
const cases: { name: string; shape: TuckShapeInput; hits: number[]; baseGainDb?: number }[] = [
  { name: 'the CLI example (−40 dB, 3 ms lead-in, 100 ms recovery)', shape: { points: [{ tMs: -3, gainDb: 0 }, { tMs: 0, gainDb: -40 }, { tMs: 50, gainDb: -40 }, { tMs: 150, gainDb: 0 }], slopeGuardMs: 5 }, hits: [0.5, 1.5] },
  { name: 'a drawn near-step to the floor and back (0.1 ms ramps, −60 dB)', shape: { points: [{ tMs: -0.1, gainDb: 0 }, { tMs: 0, gainDb: -60 }, { tMs: 30, gainDb: -60 }, { tMs: 30.1, gainDb: 0 }] }, hits: [0.5, 1.5] },
  { name: 'a shallow −6 dB tuck with 0.5 ms ramps', shape: { points: [{ tMs: -0.5, gainDb: 0 }, { tMs: 0, gainDb: -6 }, { tMs: 40, gainDb: -6 }, { tMs: 40.5, gainDb: 0 }] }, hits: [0.5, 1.5] },
  { name: 'smooth points, base gain −10 dB, close hits merging (60 ms apart)', shape: { points: [{ tMs: -2, gainDb: 0, curve: 'smooth' }, { tMs: 0, gainDb: -30, curve: 'smooth' }, { tMs: 20, gainDb: -30, curve: 'smooth' }, { tMs: 25, gainDb: 0 }] }, hits: [0.5, 0.56, 1.5], baseGainDb: -10 },
];

function stampedGains(c: (typeof cases)[number]): Float32Array {
  const hits = c.hits.map((timeSec) => ({ timeSec, strength: 1, enabled: true }));
  const { curve } = stampForLane(hits, { shape: c.shape, baseGainDb: c.baseGainDb ?? 0 }, { durationSec: SONG_SEC, rampToleranceDb: RENDER_RAMP_TOLERANCE_DB });
  // Relative to the base gain: the base gain itself is a constant factor and changes nothing in the ratio.
  const rel: GainCurve = { points: curve.points.map((p) => ({ timeSec: p.timeSec, gainDb: p.gainDb - (c.baseGainDb ?? 0) })) };
  return sampleGainCurve(rel, SONG_SEC * FS, FS);
}

describe('slope guard: stamped ramps do not click (REFERENCES.md "Gain changes and clicks")', () => {
  it('the measurement itself agrees with the reference: an abrupt step clicks (ref. −36 dB), a 5 ms raised cosine ≈ −85 dB (±6 dB) at 55 Hz', () => {
    // The step sits on a crest of the sine (1 s + a quarter period), where it jumps the most.
    const at = 1 + 1 / (4 * 55);
    const step = new Float32Array(SONG_SEC * FS);
    const rc = new Float32Array(SONG_SEC * FS);
    for (let n = 0; n < step.length; n++) {
      const t = n / FS - at;
      step[n] = t < 0 ? 0.01 : 1;
      const u = Math.min(1, Math.max(0, t / 0.005));
      rc[n] = 0.01 + 0.99 * (1 - Math.cos(Math.PI * u)) / 2;
    }
    // REFERENCES.md gives no phase for its step: on a crest we measure −29 dB, on a zero
    // crossing −59 dB, so we only ask that the step clicks (above −40) and the ramp does not.
    expect(splatterDb(step, 55, at)).toBeGreaterThan(-40);
    expect(Math.abs(splatterDb(rc, 55, at + 0.0025) - -85)).toBeLessThan(6);
  });

  for (const c of cases) {
    it(`${c.name}: ≥ 60 dB below the sine at 30, 55 and 110 Hz`, () => {
      const gains = stampedGains(c);
      const centres = rampCentres(c.shape, c.hits, c.baseGainDb ?? 0);
      expect(centres.length).toBeGreaterThanOrEqual(2 * c.hits.length);
      let worst = -Infinity;
      for (const f of [30, 55, 110]) for (const t of centres) worst = Math.max(worst, splatterDb(gains, f, t));
      expect(worst).toBeLessThanOrEqual(-60);
    });
  }

  it('without the guard the same near-step would click (the test can fail): drawn 0.1 ms ramps rendered as drawn', () => {
    const gains = new Float32Array(SONG_SEC * FS);
    for (let n = 0; n < gains.length; n++) {
      const t = n / FS;
      gains[n] = t >= 0.4999 && t < 0.5301 ? 0.001 : 1;
    }
    expect(splatterDb(gains, 55, 0.5)).toBeGreaterThan(-50);
  });
});
