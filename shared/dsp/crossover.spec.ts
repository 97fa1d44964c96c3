import { describe, expect, it } from 'vitest';
import { createBandSplitter, linkwitzRiley4LowBands } from './crossover';

function rms(x: Float32Array, from = 0) {
  let s = 0;
  for (let i = from; i < x.length; i++) s += x[i] * x[i];
  return Math.sqrt(s / (x.length - from));
}

function sine(hz: number, fs: number, seconds: number) {
  const out = new Float32Array(Math.round(fs * seconds));
  for (let i = 0; i < out.length; i++) out[i] = Math.sin((2 * Math.PI * hz * i) / fs);
  return out;
}

describe('Linkwitz–Riley 4th-order crossover', () => {
  const fs = 48_000;
  const fc = 120;

  it('sums flat in magnitude (within 0.1 dB) from 20 Hz to 20 kHz', () => {
    // LR4's low + high is an all-pass (Lipshitz & Vanderkooy 1981): |L+H| = 1 at every frequency.
    for (const hz of [20, 40, 80, 120, 180, 500, 2000, 10_000, 20_000]) {
      const x = sine(hz, fs, 2);
      const lo = new Float32Array(x.length);
      const hi = new Float32Array(x.length);
      createBandSplitter(fc, fs).split(x, lo, hi);
      const sum = lo.map((v, i) => v + hi[i]);
      const settle = fs; // skip the first second: the filters' start-up transient
      const db = 20 * Math.log10(rms(sum, settle) / rms(x, settle));
      expect(Math.abs(db), `${hz} Hz`).toBeLessThan(0.1);
    }
  });

  it('puts each output at −6.02 dB at the crossover (Linkwitz 1976, from memory)', () => {
    const x = sine(fc, fs, 2);
    const lo = new Float32Array(x.length);
    const hi = new Float32Array(x.length);
    createBandSplitter(fc, fs).split(x, lo, hi);
    expect(20 * Math.log10(rms(lo, fs) / rms(x, fs))).toBeCloseTo(-6.02, 1);
    expect(20 * Math.log10(rms(hi, fs) / rms(x, fs))).toBeCloseTo(-6.02, 1);
  });

  it('keeps state across blocks: split in blocks equals split whole', () => {
    const x = sine(55, fs, 0.5);
    const loWhole = new Float32Array(x.length);
    const hiWhole = new Float32Array(x.length);
    createBandSplitter(fc, fs).split(x, loWhole, hiWhole);
    const s = createBandSplitter(fc, fs);
    const lo = new Float32Array(x.length);
    const hi = new Float32Array(x.length);
    for (let at = 0; at < x.length; at += 1000) {
      const end = Math.min(x.length, at + 1000);
      s.split(x.subarray(at, end), lo.subarray(at, end), hi.subarray(at, end));
    }
    for (let i = 0; i < x.length; i += 97) expect(lo[i]).toBeCloseTo(loWhole[i], 6);
  });
});

describe('linkwitzRiley4LowBands (known by construction: the splitter\'s low band, computed alone)', () => {
  const fs = 48_000;
  let seed = 3;
  const rand = () => ((seed = (seed * 1664525 + 1013904223) >>> 0) / 4294967296) * 2 - 1;
  const lowOf = (x: Float32Array) => {
    const lo = new Float32Array(x.length);
    createBandSplitter(150, fs).split(x, lo, new Float32Array(x.length));
    return lo;
  };

  it('equals createBandSplitter\'s low output sample for sample, for one, two and three signals of unequal lengths', () => {
    const inputs = [4000, 2500, 3001].map((n) => Float32Array.from({ length: n }, () => rand()));
    for (const count of [1, 2, 3]) {
      const lows = linkwitzRiley4LowBands(inputs.slice(0, count), 150, fs);
      lows.forEach((lo, s) => expect(Array.from(lo)).toEqual(Array.from(lowOf(inputs[s]))));
    }
  });

  it('filters in place when an input is its own output', () => {
    const x = Float32Array.from({ length: 3000 }, () => rand());
    const expected = lowOf(x);
    linkwitzRiley4LowBands([x], 150, fs, [x]);
    expect(Array.from(x)).toEqual(Array.from(expected));
  });
});
