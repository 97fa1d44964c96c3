import { describe, expect, it } from 'vitest';
import { carryOverEdits, type StoredHit } from './carry-over';

const hit = (timeSec: number, extra: Partial<StoredHit> = {}): StoredHit => ({ timeSec, strength: 0.9, enabled: true, depthDb: null, origin: 'detected', ...extra });

describe('carryOverEdits', () => {
  it('carries off-switches, per-hit depths and hand-added hits onto a new detection (known by construction)', () => {
    const previous = [hit(0.5), hit(1.0, { enabled: false }), hit(1.5, { depthDb: -30 }), hit(2.0), hit(2.25, { origin: 'added' })];
    // The new revision: 1.0 moved 3 ms late, 2.0 is gone, 3.0 is new.
    const detected = [hit(0.5004), hit(1.003), hit(1.5), hit(3.0)];
    const { hits, summary } = carryOverEdits(previous, detected);
    expect(hits.map((h) => [h.timeSec, h.enabled, h.depthDb, h.origin])).toEqual([
      [0.5004, true, null, 'detected'],
      [1.003, false, null, 'detected'],
      [1.5, true, -30, 'detected'],
      [2.25, true, null, 'added'],
      [3.0, true, null, 'detected'],
    ]);
    expect(summary.added).toEqual([3.0]);
    expect(summary.removed).toEqual([2.0]);
    expect(summary.moved).toEqual([[1.0, 1.003]]);
    expect(summary.editsCarried).toBe(3);
  });

  it('matches one to one, nearest first, so two close hits do not share one edit', () => {
    const previous = [hit(1.0, { enabled: false }), hit(1.008)];
    const detected = [hit(1.007)];
    const { hits, summary } = carryOverEdits(previous, detected);
    expect(hits).toHaveLength(1);
    expect(hits[0].enabled).toBe(true);
    expect(summary.removed).toEqual([1.0]);
  });

  it('reports nothing as added on a first detection', () => {
    const { summary } = carryOverEdits([], [hit(0.1), hit(0.2)]);
    expect(summary.added).toEqual([]);
  });
});
