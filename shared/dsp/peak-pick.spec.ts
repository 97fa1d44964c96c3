import { describe, expect, it } from 'vitest';
import { movingMedian, pickPeaks } from './peak-pick';

describe('moving median and peak picking (Bello et al. 2005 §IV-B)', () => {
  it('the moving median equals the middle value of the sorted window (property, seeded data)', () => {
    let s = 12345;
    const v = Float32Array.from({ length: 3000 }, () => {
      s = (Math.imul(s, 1664525) + 1013904223) >>> 0;
      return (s >>> 8) % 7 === 0 ? 0 : s / 2 ** 32;
    });
    const m = movingMedian(v, 40, 1);
    for (const c of [0, 17, 1500, 2999]) {
      const w = Array.from(v.subarray(Math.max(0, c - 40), Math.min(v.length, c + 41))).sort((a, b) => a - b);
      expect(m[c]).toBe(w[w.length >> 1]);
    }
  });
  it('keeps local maxima above δ + λ·median, one per plateau (known by construction)', () => {
    const v = new Float32Array(200);
    v[50] = 12;
    v[51] = 12;
    v[120] = 4;
    v[150] = 30;
    v[155] = 20;
    expect(pickPeaks(v, 10, 1, 20, 10)).toEqual([50, 150]);
  });
});
