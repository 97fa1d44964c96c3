import { describe, expect, it } from 'vitest';
import { tuckShapeSchema, type TuckShape } from '../schemas/tuck-shape';
import { buildTuckTemplate, guardShape, minEaseMs, slopeCaps, easeDb } from './slope-guard';
import { sampleGainCurve } from './gain';
import { mulberry32 as rng } from './prng';

/** A random drawn shape that spans the hit (a point before 0 and one after it). */
function randomShape(r: () => number): { shape: TuckShape; baseGainDb: number } {
  const n = 2 + Math.floor(r() * 6);
  const times = new Set<number>();
  times.add(-(0.1 + r() * 20));
  times.add(0.1 + r() * 200);
  if (r() < 0.6) times.add(0);
  while (times.size < n) times.add(Math.round((-20 + r() * 300) * 10) / 10);
  const sorted = [...times].sort((a, b) => a - b);
  const points = sorted.map((tMs) => ({ tMs, gainDb: r() < 0.2 ? 0 : -r() * 70, curve: r() < 0.5 ? ('linear' as const) : ('smooth' as const) }));
  const shape = tuckShapeSchema.parse({ points, slopeGuardMs: 0.5 + r() * 19.5, floorDb: -30 - r() * 50, depthDb: r() < 0.3 ? -r() * 50 : null });
  return { shape, baseGainDb: -20 + r() * 26 };
}

const cliShape = tuckShapeSchema.parse({ points: [{ tMs: -3, gainDb: 0 }, { tMs: 0, gainDb: -40 }, { tMs: 50, gainDb: -40 }, { tMs: 150, gainDb: 0 }], slopeGuardMs: 5 });

/** Drawn value at t (straight or eased), ms/dB: the reference for "depth at the hit is kept". */
function drawnAt(shape: TuckShape, tMs: number, baseGainDb: number): number {
  const p = shape.points;
  const deepest = Math.min(...p.map((q) => q.gainDb));
  const scale = shape.depthDb !== null && deepest < 0 ? shape.depthDb / deepest : 1;
  const caps = slopeCaps(shape, baseGainDb);
  const clamp = (g: number) => Math.max(g * scale, caps.floorRelDb);
  for (let i = 0; i + 1 < p.length; i++) {
    if (tMs >= p[i].tMs && tMs <= p[i + 1].tMs) {
      const u = (tMs - p[i].tMs) / (p[i + 1].tMs - p[i].tMs);
      const a = clamp(p[i].gainDb);
      const b = clamp(p[i + 1].gainDb);
      return p[i].curve === 'smooth' ? easeDb(a, b, u, caps) : a + (b - a) * u;
    }
  }
  throw new Error('outside');
}

describe('slope guard', () => {
  it('caps the dB slope at |floor − base| / slopeGuardMs and keeps the gain at the hit (property, 400 random shapes; known by construction)', () => {
    const r = rng(7);
    let worstRatio = 0;
    let worstHitError = 0;
    let belowFloor = 0;
    let badEnds = 0;
    let tested = 0;
    for (let k = 0; k < 400; k++) {
      const { shape, baseGainDb } = randomShape(r);
      const caps = slopeCaps(shape, baseGainDb);
      const tpl = buildTuckTemplate(shape, { baseGainDb });
      if (tpl.tMs.length === 0) continue;
      tested++;
      for (let i = 1; i < tpl.tMs.length; i++) {
        const dt = tpl.tMs[i] - tpl.tMs[i - 1];
        worstRatio = Math.max(worstRatio, dt > 0 ? Math.abs(tpl.gainDb[i] - tpl.gainDb[i - 1]) / dt / caps.dbPerMs : Infinity);
        if (tpl.gainDb[i] < caps.floorRelDb - 1e-9) belowFloor++;
      }
      if (tpl.gainDb[0] !== 0 || tpl.gainDb[tpl.gainDb.length - 1] !== 0) badEnds++;
      worstHitError = Math.max(worstHitError, Math.abs(interp(tpl.tMs, tpl.gainDb, 0) - drawnAt(shape, 0, baseGainDb)));
    }
    expect(tested).toBeGreaterThan(300);
    expect(worstRatio).toBeLessThanOrEqual(1 + 1e-9);
    expect(belowFloor).toBe(0);
    expect(badEnds).toBe(0);
    // The gain at the hit is the drawn one (scaled, floored), within the live ramp sampling tolerance (0.05 dB).
    expect(worstHitError).toBeLessThanOrEqual(0.05 + 1e-9);
  });

  it('caps the amplitude slope at |10^(base/20) − 10^(floor/20)| / slopeGuardMs: breakpoint secants, and a 48 kHz render at render precision (property; known by construction)', () => {
    const r = rng(11);
    let worstSecant = 0;
    let worstRendered = 0;
    for (let k = 0; k < 200; k++) {
      const { shape, baseGainDb } = randomShape(r);
      const caps = slopeCaps(shape, baseGainDb);
      const tpl = buildTuckTemplate(shape, { baseGainDb, rampToleranceDb: 0.002 });
      if (tpl.tMs.length === 0) continue;
      const amp = Array.from(tpl.gainDb, (g) => Math.pow(10, g / 20));
      for (let i = 1; i < amp.length; i++) worstSecant = Math.max(worstSecant, Math.abs(amp[i] - amp[i - 1]) / (tpl.tMs[i] - tpl.tMs[i - 1]) / caps.ampPerMs);
      const fs = 48_000;
      const curve = { points: Array.from(tpl.tMs, (t, i) => ({ timeSec: (t - tpl.startMs) / 1000 + 0.001, gainDb: tpl.gainDb[i] })) };
      const frames = Math.ceil(((tpl.endMs - tpl.startMs) / 1000 + 0.002) * fs);
      const a = sampleGainCurve(curve, frames, fs);
      for (let n = 1; n < frames; n++) worstRendered = Math.max(worstRendered, (Math.abs(a[n] - a[n - 1]) * fs) / 1000 / caps.ampPerMs);
    }
    expect(worstSecant).toBeLessThanOrEqual(1);
    // Float32 gains: 1e-4 covers their rounding.
    expect(worstRendered).toBeLessThanOrEqual(1 + 1e-4);
  });

  it('widens a steep lead-in earlier and a steep recovery later, never moving the bottom (the CLI example shape)', () => {
    const g = guardShape(cliShape);
    expect(g[0].tMs).toBeLessThan(-3);
    expect(g.find((p) => p.gainDb === -40)!.tMs).toBe(0);
    expect(g.filter((p) => p.gainDb === -40).map((p) => p.tMs)).toEqual([0, 50]);
    expect(g[g.length - 1].tMs).toBe(150); // 40 dB over 100 ms is gentle enough to stay as drawn
    expect(g[0].curve).toBe('smooth');
    // Lead-in = the shortest ease for 40 dB at the default caps.
    expect(-g[0].tMs).toBeCloseTo(minEaseMs(0, -40, slopeCaps(cliShape)), 9);
    expect(-g[0].tMs).toBeLessThan(12);
  });

  it('adds ramps from and back to the base gain when the drawn ends are below it', () => {
    const shape = tuckShapeSchema.parse({ points: [{ tMs: 0, gainDb: -30 }, { tMs: 40, gainDb: -30 }] });
    const g = guardShape(shape);
    expect(g[0].gainDb).toBe(0);
    expect(g[0].tMs).toBeLessThan(0);
    expect(g[1]).toMatchObject({ tMs: 0, gainDb: -30 });
    expect(g[g.length - 1].gainDb).toBe(0);
    expect(g[g.length - 1].tMs).toBeGreaterThan(40);
  });

  it('a full swing takes π/2 × slopeGuardMs at the dB cap when the amplitude cap is not binding (known by construction)', () => {
    const caps = slopeCaps(cliShape);
    // Down to the floor: most of the swing lies below the crossover, where only the dB cap binds.
    expect(minEaseMs(0, -60, caps)).toBeGreaterThanOrEqual((Math.PI / 2) * 5);
    expect(minEaseMs(0, -60, caps)).toBeLessThan(4 * 5);
  });
});

/** Straight-line interpolation in a breakpoint list (binary search). */
function interp(t: ArrayLike<number>, g: ArrayLike<number>, x: number): number {
  if (x <= t[0]) return g[0];
  if (x >= t[t.length - 1]) return g[g.length - 1];
  let lo = 0;
  let hi = t.length - 1;
  while (hi - lo > 1) {
    const mid = (lo + hi) >> 1;
    if (t[mid] <= x) lo = mid;
    else hi = mid;
  }
  return g[lo] + ((g[hi] - g[lo]) * (x - t[lo])) / (t[hi] - t[lo]);
}
