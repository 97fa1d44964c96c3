import { describe, expect, it } from 'vitest';
import { amplitudeMemo, DbMemo } from './gain-memo';

describe('DbMemo', () => {
  it('returns the function\'s own value for every dB, repeated or not, through slot collisions (property)', () => {
    let calls = 0;
    const memo = new DbMemo((db) => {
      calls++;
      return Math.pow(10, db / 40);
    });
    // 20,000 distinct values overflow the 4,096 slots many times over; each is asked for three times.
    const dbs = Array.from({ length: 20_000 }, (_, i) => -90 + (i * 97.31) % 100);
    for (let pass = 0; pass < 3; pass++) for (const db of dbs) expect(memo.of(db)).toBe(Math.pow(10, db / 40));
    expect(calls).toBeLessThan(3 * dbs.length);
    // The gains of a stamped curve repeat: a few dozen values cost a few dozen calls.
    calls = 0;
    const few = [-2, -2.105, -42, -40, -18.5, 0, -0];
    for (let i = 0; i < 10_000; i++) memo.of(few[i % few.length]);
    expect(calls).toBeLessThanOrEqual(few.length);
  });

  it('amplitudeMemo is 10^(G/20) within 1e-14 relative, far inside the 1e-12 the CSV writer leaves around rounding ties (e^(G·ln10/20); IEC 60027-3)', () => {
    const memo = amplitudeMemo();
    for (let db = -120; db <= 24; db += 0.0137) {
      const want = Math.pow(10, db / 20);
      expect(Math.abs(memo.of(db) - want)).toBeLessThanOrEqual(1e-14 * want);
    }
  });
});
