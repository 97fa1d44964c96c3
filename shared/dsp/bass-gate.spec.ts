import { describe, expect, it } from 'vitest';
import { bassSilenceTest } from './bass-gate';

describe('bassSilenceTest', () => {
  // 5 ms hops: bass plays from 1.000 s up to 2.000 s (hops 200–399) at −12 dBFS, silence elsewhere (known by construction).
  const peakDbfs = new Float32Array(600).fill(-Infinity);
  for (let k = 200; k < 400; k++) peakDbfs[k] = -12;
  const silent = bassSilenceTest({ hopSec: 0.005, peakDbfs }, -50);

  it('calls a window silent only when every hop in it is below the threshold', () => {
    expect(silent(0.2, 0.35)).toBe(true);
    expect(silent(0.9, 1.01)).toBe(false);
    expect(silent(1.5, 1.6)).toBe(false);
    expect(silent(2.001, 2.5)).toBe(true);
  });

  it('counts a hop at exactly the threshold as sound', () => {
    const edge = bassSilenceTest({ hopSec: 0.005, peakDbfs: [-60, -50, -60] }, -50);
    expect(edge(0, 0.014)).toBe(false);
    expect(edge(0, 0.004)).toBe(true);
  });

  it('treats windows past the end as silent', () => {
    expect(silent(10, 11)).toBe(true);
  });
});
