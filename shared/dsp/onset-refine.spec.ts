import { describe, expect, it } from 'vitest';
import { biquadLowpass, cascadeState, processCascadeInPlace } from './biquad';
import { aicChangePoint, arAicChangePoint, predictionError8, refineOnsetSample, zeroPhaseDecimate } from './onset-refine';

/** Seeded uniform noise (a 32-bit LCG, Numerical Recipes constants). */
function noise(n: number, amplitude: number, seed = 1): Float32Array {
  let s = seed >>> 0;
  return Float32Array.from({ length: n }, () => {
    s = (Math.imul(s, 1664525) + 1013904223) >>> 0;
    return amplitude * (s / 2 ** 32 - 0.5);
  });
}

describe('AIC onset pickers (Maeda 1985; Sleeman & van Eck 1999)', () => {
  it('finds a variance step in noise within a few samples (known by construction)', () => {
    const x = noise(4000, 0.01);
    const loud = noise(1500, 1, 7);
    x.set(loud, 2500);
    const at = aicChangePoint(x, 1000, 4000);
    expect(Math.abs(at - 2500)).toBeLessThanOrEqual(3);
  });
  it('AR-AIC finds a new sine under a louder ringing sine that plain AIC is fooled by', () => {
    const fs = 48000;
    const onset = 30000;
    const x = new Float32Array(48000);
    for (let i = 0; i < x.length; i++) {
      x[i] = 0.6 * Math.sin((2 * Math.PI * 48 * i) / fs) * Math.exp(-i / fs / 0.8) + 1e-4 * Math.sin(i * 1.7);
      if (i >= onset) x[i]! += 0.5 * Math.sin((2 * Math.PI * 150 * (i - onset)) / fs);
    }
    const start = onset - 1440;
    const end = onset + 600;
    const ar = arAicChangePoint(x, start, end, 960, 8);
    expect(Math.abs(ar - onset)).toBeLessThanOrEqual(48);
  });
  it('the 4 kHz picker lands within 1 ms of a soft low onset under noise', () => {
    const fs = 96000;
    const onset = 50000;
    const x = noise(96000, 0.02, 3);
    for (let i = onset; i < x.length; i++) {
      const t = (i - onset) / fs;
      const attack = t < 0.002 ? 0.5 - 0.5 * Math.cos((Math.PI * t) / 0.002) : 1;
      x[i]! += 0.5 * attack * Math.sin(2 * Math.PI * 70 * t);
    }
    const at = refineOnsetSample(x, fs, onset - 0.02 * fs, onset + 0.01 * fs, 0.02);
    expect(Math.abs(at - onset) / fs).toBeLessThan(0.001);
  });
});

describe('the pickers\' fast loops equal the plain ones bit for bit', () => {
  it('predictionError8 gives the general order-p loop\'s errors', () => {
    const x = noise(3000, 0.8, 3);
    const coef = Float64Array.from([1.9, -1.2, 0.33, -0.05, 0.011, -0.4, 0.2, -0.07]);
    for (const [a, n] of [[8, 100], [500, 2016], [2990, 10]] as const) {
      const fast = new Float32Array(n);
      predictionError8(x, a, n, coef, fast);
      const plain = new Float32Array(n);
      for (let i = 0; i < n; i++) {
        let pred = 0;
        for (let k = 0; k < 8; k++) pred += coef[k]! * x[a + i - 1 - k]!;
        plain[i] = x[a + i]! - pred;
      }
      expect(Array.from(fast)).toEqual(Array.from(plain));
    }
  });

  it('zeroPhaseDecimate gives filter, reverse, filter, reverse and pick', () => {
    const x = noise(6000, 1, 5);
    for (const [fs, factor, offset, from, length] of [[48000, 12, 5, 100, 3217], [44100, 11, 0, 0, 2000], [96000, 24, 23, 37, 4001]] as const) {
      const lp = biquadLowpass(500, fs, Math.SQRT1_2);
      const copy = x.slice(from, from + length);
      processCascadeInPlace([lp], cascadeState([lp]), copy);
      copy.reverse();
      processCascadeInPlace([lp], cascadeState([lp]), copy);
      copy.reverse();
      const want = new Float32Array(Math.floor((length - offset) / factor));
      for (let j = 0; j < want.length; j++) want[j] = copy[offset + j * factor]!;
      const got = new Float32Array(want.length);
      zeroPhaseDecimate(x, from, lp, new Float32Array(length), factor, offset, got);
      expect(Array.from(got)).toEqual(Array.from(want));
    }
  });
});
