import { describe, expect, it } from 'vitest';
import type { Hit } from '../schemas/hit';
import { tuckShapeSchema } from '../schemas/tuck-shape';
import { gainDbAt } from './gain';
import { buildTuckTemplate, slopeCaps } from './slope-guard';
import { stampHits } from './stamp';

const shape = tuckShapeSchema.parse({ points: [{ tMs: -3, gainDb: 0 }, { tMs: 0, gainDb: -40 }, { tMs: 50, gainDb: -40 }, { tMs: 150, gainDb: 0 }], slopeGuardMs: 5 });
const hit = (timeSec: number, extra: Partial<Hit> = {}): Hit => ({ timeSec, strength: 1, enabled: true, ...extra });
const tpl = buildTuckTemplate(shape);

describe('stampHits', () => {
  it('puts the tuck at each enabled hit and sits at the base gain elsewhere (known by construction)', () => {
    const { curve, stampedHitCount, gatedHitIndexes } = stampHits([hit(1), hit(2, { enabled: false }), hit(3)], shape, { durationSec: 4, baseGainDb: -3 });
    expect(stampedHitCount).toBe(2);
    expect(gatedHitIndexes).toEqual([]);
    expect(gainDbAt(curve, 1)).toBeCloseTo(-43, 9);
    expect(gainDbAt(curve, 1.05)).toBeCloseTo(-43, 9);
    expect(gainDbAt(curve, 3.025)).toBeCloseTo(-43, 9);
    for (const t of [0, 0.5, 0.98, 1.2, 2, 2.5, 3.2, 4]) expect(gainDbAt(curve, t)).toBe(-3);
    expect(curve.points[0].timeSec).toBe(0);
    expect(curve.points[curve.points.length - 1].timeSec).toBe(4);
    for (let i = 1; i < curve.points.length; i++) expect(curve.points[i].timeSec).toBeGreaterThan(curve.points[i - 1].timeSec);
  });

  it('merges overlapping tucks with the deeper gain winning: no notch back up between close hits (known by construction)', () => {
    const { curve } = stampHits([hit(1), hit(1.03)], shape, { durationSec: 2 });
    for (let t = 1; t <= 1.08; t += 0.0005) expect(gainDbAt(curve, t)).toBeCloseTo(-40, 9);
    // Deeper wins: a shallow hit inside a deep hit's hold changes nothing there.
    const mixed = stampHits([hit(1), hit(1.02, { depthDb: -10 })], shape, { durationSec: 2 }).curve;
    for (let t = 1; t <= 1.05; t += 0.0005) expect(gainDbAt(mixed, t)).toBeCloseTo(-40, 9);
    // And the merged curve is the pointwise minimum of the two tucks everywhere.
    const a = stampHits([hit(1)], shape, { durationSec: 2 }).curve;
    const b = stampHits([hit(1.12)], shape, { durationSec: 2 }).curve;
    const ab = stampHits([hit(1.12), hit(1)], shape, { durationSec: 2 }).curve;
    for (let t = 0.95; t < 1.35; t += 0.00037) expect(gainDbAt(ab, t)).toBeCloseTo(Math.min(gainDbAt(a, t), gainDbAt(b, t)), 9);
  });

  it('scales the shape to a hit\'s own depth and writes gains below the floor as the floor', () => {
    const { curve } = stampHits([hit(1, { depthDb: -12 }), hit(2, { depthDb: -90 })], shape, { durationSec: 3 });
    expect(gainDbAt(curve, 1.01)).toBeCloseTo(-12, 9);
    expect(gainDbAt(curve, 2.01)).toBe(-60);
    expect(Math.min(...curve.points.map((p) => p.gainDb))).toBe(-60);
    // With a base gain the floor stays absolute.
    const low = stampHits([hit(1)], shape, { durationSec: 2, baseGainDb: -30 }).curve;
    expect(gainDbAt(low, 1.01)).toBe(-60);
  });

  it('the bass gate skips hits whose whole tuck window is silent, and passes it the window', () => {
    const windows: [number, number][] = [];
    const { curve, gatedHitIndexes, stampedHitCount } = stampHits([hit(1), hit(2), hit(3)], shape, {
      durationSec: 4,
      isBassSilent: (t0, t1) => {
        windows.push([t0, t1]);
        return t0 > 1.5 && t1 < 2.5;
      },
    });
    expect(gatedHitIndexes).toEqual([1]);
    expect(stampedHitCount).toBe(2);
    expect(gainDbAt(curve, 2.01)).toBe(0);
    expect(gainDbAt(curve, 3.01)).toBeCloseTo(-40, 9);
    expect(windows[1][0]).toBeCloseTo(2 + tpl.startMs / 1000, 12);
    expect(windows[1][1]).toBeCloseTo(2 + tpl.endMs / 1000, 12);
  });

  it('clips tucks at the song edges, interpolating the gain there', () => {
    const { curve } = stampHits([hit(0.001), hit(1.95)], shape, { durationSec: 2 });
    expect(curve.points[0].timeSec).toBe(0);
    expect(curve.points[0].gainDb).toBeLessThan(-1);
    const last = curve.points[curve.points.length - 1];
    expect(last.timeSec).toBe(2);
    expect(last.gainDb).toBeLessThan(-10);
  });

  it('a base gain at or below the floor leaves the lane at the floor', () => {
    const r = stampHits([hit(1)], shape, { durationSec: 2, baseGainDb: -70 });
    expect(r.curve.points.every((p) => p.gainDb === -60)).toBe(true);
  });

  it('property: merged curves keep the dB slope cap and the floor, and each hit is at least as deep as its own tuck (random shapes and hit patterns; known by construction)', () => {
    let seed = 99;
    const r = () => {
      seed = (seed * 1664525 + 1013904223) % 4294967296;
      return seed / 4294967296;
    };
    let worstRatio = 0;
    let belowFloor = 0;
    let shallowAtHit = 0;
    let missingHitPoint = 0;
    for (let k = 0; k < 80; k++) {
      const times = new Set<number>([-(0.5 + r() * 15), 0, 5 + r() * 200]);
      while (times.size < 3 + Math.floor(r() * 4)) times.add(Math.round((-15 + r() * 250) * 10) / 10);
      const points = [...times].sort((a, b) => a - b).map((tMs) => ({ tMs, gainDb: tMs === 0 ? -10 - r() * 60 : -r() * 50, curve: r() < 0.5 ? ('linear' as const) : ('smooth' as const) }));
      const sh = tuckShapeSchema.parse({ points, slopeGuardMs: 1 + r() * 15, floorDb: -40 - r() * 40 });
      const base = -12 + r() * 18;
      const hits: Hit[] = [];
      for (let t = 0.02; t < 4; t += 0.01 + r() * 0.3) hits.push({ timeSec: t, strength: 1, enabled: r() < 0.9, depthDb: r() < 0.2 ? -r() * 40 : null });
      const { curve } = stampHits(hits, sh, { durationSec: 4, baseGainDb: base });
      const caps = slopeCaps(sh, base);
      const p = curve.points;
      for (let i = 1; i < p.length; i++) worstRatio = Math.max(worstRatio, Math.abs(p[i].gainDb - p[i - 1].gainDb) / ((p[i].timeSec - p[i - 1].timeSec) * 1000) / caps.dbPerMs);
      belowFloor += p.filter((q) => q.gainDb < sh.floorDb - 1e-9).length;
      for (const h of hits) {
        if (!h.enabled) continue;
        const own = buildTuckTemplate(sh, { baseGainDb: base, depthDb: h.depthDb });
        const i0 = own.tMs.indexOf(0);
        if (i0 < 0) missingHitPoint++;
        const at0 = own.gainDb[i0];
        if (gainDbAt(curve, h.timeSec) > base + at0 + 1e-9) shallowAtHit++;
      }
    }
    expect(worstRatio).toBeLessThanOrEqual(1 + 1e-9);
    expect(belowFloor).toBe(0);
    expect(shallowAtHit).toBe(0);
    expect(missingHitPoint).toBe(0);
  });
});
