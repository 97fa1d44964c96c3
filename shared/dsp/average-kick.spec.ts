import { describe, expect, it } from 'vitest';
import { averageKick } from './average-kick';

describe('averageKick', () => {
  it('recovers an identical kick placed at known onsets (known by construction)', () => {
    const fs = 48_000;
    const x = new Float32Array(fs * 4);
    const times = [0.5, 1.25, 2.0, 3.1];
    for (const t of times) {
      const s = Math.round(t * fs);
      for (let i = 0; i < 0.1 * fs; i++) x[s + i] = 0.8 * Math.exp(-i / (0.02 * fs)) * Math.sin((2 * Math.PI * 60 * i) / fs);
    }
    const avg = averageKick(x, fs, times, 10, 200, 0.5);
    expect(avg.hitCount).toBe(4);
    expect(avg.startMs).toBe(-10);
    // Before the onset: nothing.
    expect(Math.max(...avg.rms.slice(0, 19).map(Math.abs))).toBe(0);
    // The loudest step is within the first few ms after the onset, at about 0.8·e^(−t/20ms).
    const peakAt = avg.rms.indexOf(Math.max(...avg.rms));
    const peakMs = avg.startMs + peakAt * avg.stepMs;
    expect(peakMs).toBeGreaterThanOrEqual(0);
    expect(peakMs).toBeLessThan(5);
    // 100 ms on, the kick has ended.
    const at150 = Math.round((150 - avg.startMs) / avg.stepMs);
    expect(avg.rms[at150]).toBe(0);
  });
});
