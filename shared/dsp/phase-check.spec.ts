import { describe, expect, it } from 'vitest';
import { phaseCheck } from './phase-check';

const fs = 48_000;
/** Decaying 55 Hz bursts at the given times (a synthetic kick body), optionally inverted and delayed. */
function bursts(times: number[], sign = 1, delayMs = 0) {
  const x = new Float32Array(fs * 3);
  for (const t of times) {
    const start = Math.round((t + delayMs / 1000) * fs);
    for (let i = 0; i < 0.2 * fs && start + i < x.length; i++) x[start + i] += sign * 0.5 * Math.sin((2 * Math.PI * 55 * i) / fs) * Math.exp(-i / (0.08 * fs));
  }
  return x;
}

describe('phaseCheck (known by construction; summing values from REFERENCES.md "Summing")', () => {
  const times = [0.5, 1.0, 1.5, 2.0];

  it('flags a bass identical to the kick as adding up by about +6 dB', () => {
    const { hits } = phaseCheck(bursts(times), bursts(times), fs, times);
    for (const h of hits) {
      expect(h.correlation).toBeGreaterThan(0.99);
      expect(h.sumVsLouderDb).toBeCloseTo(6.02, 0);
      expect(h.flag).toBe('adds');
    }
  });

  it('flags a polarity-inverted bass as cancelling and suggests flipping it', () => {
    const { hits, suggestion } = phaseCheck(bursts(times), bursts(times, -1), fs, times);
    for (const h of hits) {
      expect(h.correlation).toBeLessThan(-0.99);
      expect(h.flag).toBe('cancels');
    }
    expect(suggestion.invertBass).toBe(true);
    expect(suggestion.offsetMs).toBe(0);
    expect(suggestion.meanCorrelationSuggested).toBeGreaterThan(0.99);
  });

  it('finds a 3 ms late bass and suggests moving it 3 ms earlier', () => {
    const { suggestion } = phaseCheck(bursts(times), bursts(times, 1, 3), fs, times);
    expect(suggestion.invertBass).toBe(false);
    expect(suggestion.offsetMs).toBeCloseTo(-3, 5);
    expect(suggestion.meanCorrelationSuggested).toBeGreaterThan(suggestion.meanCorrelationNow);
  });

  it('reads the mean correlation now as the mean of the hits\' correlations, hits at either end included', () => {
    // Known by construction: both are Pearson r over the same low-band windows.
    let seed = 8;
    const rand = () => ((seed = (seed * 1664525 + 1013904223) >>> 0) / 4294967296) * 2 - 1;
    const kick = Float32Array.from({ length: fs * 3 }, () => rand());
    const bass = Float32Array.from({ length: fs * 3 }, (_, i) => 0.5 * kick[i] + 0.5 * rand());
    const edges = [0, 0.002, 1.5, 2.97, 2.999];
    const { hits, suggestion } = phaseCheck(kick, bass, fs, edges);
    const rs = hits.map((h) => h.correlation).filter(Number.isFinite);
    expect(rs.length).toBe(edges.length);
    expect(suggestion.meanCorrelationNow).toBeCloseTo(rs.reduce((a, b) => a + b, 0) / rs.length, 12);
    expect(suggestion.offsetMs).toBe(0);
    expect(suggestion.invertBass).toBe(false);
  });
});

