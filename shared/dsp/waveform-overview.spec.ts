import { describe, expect, it } from 'vitest';
import { waveformOverview } from './waveform-overview';

describe('waveformOverview', () => {
  it('keeps the true extremes at every level (known by construction)', () => {
    const mono = new Float32Array(100_000);
    for (let i = 0; i < mono.length; i++) mono[i] = 0.5 * Math.sin((2 * Math.PI * 55 * i) / 48_000);
    mono[70_123] = 0.97;
    mono[3_001] = -0.88;
    const overview = waveformOverview(mono, 48_000, [256, 2048, 16384]);
    for (const level of overview.levels) {
      let lo = 0;
      let hi = 0;
      for (let i = 0; i < level.peaks.length; i += 2) {
        lo = Math.min(lo, level.peaks[i]);
        hi = Math.max(hi, level.peaks[i + 1]);
      }
      expect(hi).toBeCloseTo(0.97, 6);
      expect(lo).toBeCloseTo(-0.88, 6);
      expect(level.peaks.length / 2).toBe(Math.ceil(mono.length / level.samplesPerBucket));
    }
    // The spike sits in the bucket that covers its sample.
    const coarse = overview.levels[2];
    expect(coarse.peaks[2 * Math.floor(70_123 / 16384) + 1]).toBeCloseTo(0.97, 6);
  });

  it('refuses bucket sizes that do not nest', () => {
    expect(() => waveformOverview(new Float32Array(10), 48_000, [256, 1000])).toThrow(/multiple/);
  });
});
