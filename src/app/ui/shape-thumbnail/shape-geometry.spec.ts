import { sampleShape, shapeDomain, shapePaths, xOf, yOf } from './shape-geometry';

const trap = { points: [{ tMs: -3, gainDb: 0, curve: 'smooth' as const }, { tMs: 0, gainDb: -18 }, { tMs: 35, gainDb: -18, curve: 'smooth' as const }, { tMs: 120, gainDb: 0 }] };
const box = { width: 160, height: 56, pad: 4 };

describe('shape geometry', () => {
  it('keeps every breakpoint and samples smooth segments along the cosine ease', () => {
    const pts = sampleShape(trap.points, 4);
    for (const p of trap.points) expect(pts).toContainEqual({ tMs: p.tMs, gainDb: p.gainDb });
    // Halfway along a cosine ease is halfway in dB.
    const mid = pts.find((p) => Math.abs(p.tMs - 77.5) < 1e-9)!;
    expect(mid.gainDb).toBeCloseTo(-9, 9);
    // A quarter along moves less than a quarter of the way: (1 − cos π/4)/2 ≈ 0.146.
    const quarter = pts.find((p) => Math.abs(p.tMs - 56.25) < 1e-9)!;
    expect(quarter.gainDb).toBeCloseTo(-18 + 18 * 0.1464466, 5);
    expect(pts.map((p) => p.tMs)).toEqual([...pts.map((p) => p.tMs)].sort((a, b) => a - b));
  });

  it('shares one domain between shapes drawn together, 0 dB at the top', () => {
    const d = shapeDomain([trap, { points: [{ tMs: -10, gainDb: 0 }, { tMs: 200, gainDb: -30 }] }]);
    expect(d.tMinMs).toBe(-10);
    expect(d.tMaxMs).toBe(200);
    expect(d.gainMinDb).toBeLessThan(-30);
    expect(yOf(0, d, box)).toBe(box.pad);
    expect(yOf(d.gainMinDb, d, box)).toBeCloseTo(box.height - box.pad, 9);
    expect(xOf(-10, d, box)).toBe(box.pad);
    expect(xOf(200, d, box)).toBeCloseTo(box.width - box.pad, 9);
  });

  it('closes the fill along the 0 dB line', () => {
    const d = shapeDomain([trap]);
    const { line, area } = shapePaths(trap, d, box);
    expect(line.startsWith('M4.00,4.00')).toBe(true);
    expect(area.startsWith('M4.00,4.00')).toBe(true);
    expect(area.endsWith(`L156.00,4.00Z`)).toBe(true);
  });
});
