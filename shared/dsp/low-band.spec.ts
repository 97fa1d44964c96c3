import { describe, expect, it } from 'vitest';
import { createLowBandBuilder, finishLowBand, lowBandOf, pushLowBand, pushLowBandInStages } from './low-band';

/** A deterministic test signal: a 50 Hz kick-like burst every half second plus broadband noise (linear congruential). */
function signal(n: number, fs: number, seed: number): Float32Array {
  const x = new Float32Array(n);
  let r = seed;
  for (let i = 0; i < n; i++) {
    r = (r * 1664525 + 1013904223) >>> 0;
    const t = (i % Math.round(fs / 2)) / fs;
    x[i] = 0.8 * Math.exp(-t * 12) * Math.sin(2 * Math.PI * 50 * t) + 0.05 * (r / 2 ** 32 - 0.5);
  }
  return x;
}

/** Block lengths that take both paths: odd blocks (a sample left waiting for its pair), empty ones, even ones after an odd one. */
const BLOCKS = [1, 0, 7, 4096, 1, 333, 65536, 2, 9999, 174762, 174762];

describe('low band: the one-pass path for whole groups', () => {
  for (const fs of [48000, 44100, 22050, 96000]) {
    it(`gives the staged path's samples bit for bit at ${fs} Hz, whatever the block lengths`, () => {
      const x = signal(fs * 9 + 5, fs, fs);
      const mixed = createLowBandBuilder(fs, x.length, 120);
      const staged = createLowBandBuilder(fs, x.length, 120);
      let at = 0;
      for (let b = 0; at < x.length; b++) {
        const block = x.subarray(at, at + BLOCKS[b % BLOCKS.length]!);
        pushLowBand(mixed, block);
        pushLowBandInStages(staged, block);
        at += block.length;
      }
      const a = finishLowBand(mixed).samples;
      const b = finishLowBand(staged).samples;
      expect(a.length).toBe(b.length);
      let differing = 0;
      for (let i = 0; i < a.length; i++) if (!Object.is(a[i], b[i])) differing++;
      expect(differing).toBe(0);
      // Not vacuous: the band holds the 50 Hz bursts.
      let peak = 0;
      for (const v of a) peak = Math.max(peak, Math.abs(v));
      expect(peak).toBeGreaterThan(0.3);
    });
  }
});

describe('low band: what the pre-decimation folds onto the band', () => {
  /** RMS of the low band's second half (the filters settled). */
  function bandRms(fs: number, toneHz: number): number {
    const n = fs * 2;
    const x = Float32Array.from({ length: n }, (_, i) => Math.sin((2 * Math.PI * toneHz * i) / fs));
    const band = lowBandOf(x, fs, 120).samples;
    let e = 0;
    const from = band.length >> 1;
    for (let i = from; i < band.length; i++) e += band[i]! * band[i]!;
    return Math.sqrt(e / (band.length - from));
  }
  // Known by construction: a tone 100 Hz below fs/4 folds onto 100 Hz when the
  // 4-tap boxcar takes the rate to fs/4, whose response there is
  // |sin(4πf/fs) / (4·sin(πf/fs))| = −38.5 dB at 48 kHz (−44.6 dB at 96 kHz).
  for (const [fs, minDb] of [[48000, 37], [96000, 43]] as const) {
    it(`keeps a tone that folds onto 100 Hz at least ${minDb} dB under a 100 Hz tone at ${fs} Hz`, () => {
      const inBand = bandRms(fs, 100);
      const folded = bandRms(fs, fs / 4 - 100);
      expect(inBand).toBeGreaterThan(0.5); // the 100 Hz tone passes the 120 Hz band edge
      expect(20 * Math.log10(folded / inBand)).toBeLessThan(-minDb);
    });
  }
});
