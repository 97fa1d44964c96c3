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
  it('the moving median is exact where zeros fill most of a window, and where negative values sit among them', () => {
    let s = 777;
    const next = () => (s = (Math.imul(s, 1664525) + 1013904223) >>> 0) / 2 ** 32;
    // Stretches of mostly zeros (as a rise function is between hits), stretches of mostly values, and a few negatives.
    const v = Float32Array.from({ length: 4000 }, (_, i) => {
      const zeroish = Math.floor(i / 300) % 2 === 0;
      const r = next();
      if (zeroish) return r < 0.7 ? 0 : i % 11 === 0 ? -r : r * 10;
      return r < 0.3 ? 0 : r * 10;
    });
    const m = movingMedian(v, 100, 1);
    for (let c = 0; c < v.length; c++) {
      const w = Array.from(v.subarray(Math.max(0, c - 100), Math.min(v.length, c + 101))).sort((a, b) => a - b);
      expect(m[c]).toBe(w[w.length >> 1]);
    }
    // At the edge of the shortcut, by construction: 201 values, exactly 100 zeros, so the
    // middle one (index 100) is the smallest positive; with one zero more it is 0, negatives or not.
    const edge = Float32Array.from({ length: 201 }, (_, i) => (i % 2 === 0 && i < 200 ? 0 : 5 + i));
    expect(movingMedian(edge, 100, 1)[100]).toBe(6);
    const more = Float32Array.from({ length: 201 }, (_, i) => (i <= 100 ? 0 : i < 150 ? -1 : 3));
    expect(movingMedian(more, 100, 1)[100]).toBe(0);
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
