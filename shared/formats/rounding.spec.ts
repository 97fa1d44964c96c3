import { describe, expect, it } from 'vitest';
import { roundNonNegative } from './rounding';
import { mulberry32 as rng } from '../dsp/prng';

/** The next double above or below x (x > 0), through its bits. */
function step(x: number, ulps: number): number {
  const f = new Float64Array([x]);
  const b = new BigInt64Array(f.buffer);
  b[0] += BigInt(ulps);
  return f[0];
}

describe('roundNonNegative', () => {
  it('is Math.round (ECMA-262: ties towards +∞) on half-integers and the doubles around them, powers of two, and random values (property)', () => {
    const r = rng(17);
    const ys: number[] = [0, 0.5, 0.49999999999999994, 1, 2 ** 52 - 0.5, 2 ** 52, 2 ** 52 + 1, 2 ** 53, 1e300];
    for (let i = 0; i < 20_000; i++) {
      const half = Math.floor(r() * 2 ** (r() * 40)) + 0.5;
      for (let u = -3; u <= 3; u++) ys.push(step(half, u));
      ys.push(r() * 10 ** Math.floor(r() * 12));
    }
    for (let e = -4; e <= 60; e++) for (let u = -2; u <= 2; u++) ys.push(step(2 ** e, u), step(2 ** e - 0.5, u), step(2 ** e + 0.5, u));
    const wrong = ys.filter((y) => y >= 0 && roundNonNegative(y) !== Math.round(y));
    expect(wrong).toEqual([]);
    expect(ys.length).toBeGreaterThan(150_000);
  });
});
