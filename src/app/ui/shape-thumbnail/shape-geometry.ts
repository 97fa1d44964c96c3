import type { TuckPoint } from '../../../../shared/schemas/tuck-shape';

/** What a drawing needs of a shape: its breakpoints (tMs relative to the hit, gainDb ≤ 0). */
export interface DrawnShape {
  points: readonly TuckPoint[];
}

export interface ShapeDomain {
  /** Earliest and latest time drawn, ms. */
  tMinMs: number;
  tMaxMs: number;
  /** Deepest gain drawn, dB (< 0). The top of the drawing is 0 dB. */
  gainMinDb: number;
}

export interface PlotBox {
  width: number;
  height: number;
  /** Inset on every side, in the same units. */
  pad: number;
  /** A wider inset on the left, for axis labels. */
  padLeft?: number;
}

/**
 * The shape as a polyline in (tMs, gainDb). Linear segments keep their two
 * ends; 'smooth' segments are sampled along the cosine ease the stamper uses
 * (gain = g₀ + (g₁ − g₀)·(1 − cos πu)/2, u ∈ [0, 1], in dB), `steps` samples each.
 */
export function sampleShape(points: readonly TuckPoint[], steps = 12): { tMs: number; gainDb: number }[] {
  const out: { tMs: number; gainDb: number }[] = [];
  points.forEach((p, i) => {
    out.push({ tMs: p.tMs, gainDb: p.gainDb });
    const next = points[i + 1];
    if (!next || p.curve !== 'smooth') return;
    for (let k = 1; k < steps; k++) {
      const u = k / steps;
      out.push({ tMs: p.tMs + (next.tMs - p.tMs) * u, gainDb: p.gainDb + (next.gainDb - p.gainDb) * ((1 - Math.cos(Math.PI * u)) / 2) });
    }
  });
  return out;
}

/** One domain for several shapes, so shapes drawn together share their axes. */
export function shapeDomain(shapes: readonly DrawnShape[]): ShapeDomain {
  let tMinMs = Infinity;
  let tMaxMs = -Infinity;
  let gainMinDb = 0;
  for (const s of shapes) {
    for (const p of s.points) {
      tMinMs = Math.min(tMinMs, p.tMs);
      tMaxMs = Math.max(tMaxMs, p.tMs);
      gainMinDb = Math.min(gainMinDb, p.gainDb);
    }
  }
  if (!Number.isFinite(tMinMs)) return { tMinMs: 0, tMaxMs: 100, gainMinDb: -12 };
  if (tMaxMs - tMinMs < 1) tMaxMs = tMinMs + 1;
  // A flat shape still gets a visible depth range; a little room below the deepest point.
  return { tMinMs, tMaxMs, gainMinDb: Math.min(-1, gainMinDb * 1.08) };
}

export function xOf(tMs: number, d: ShapeDomain, box: PlotBox): number {
  const left = box.padLeft ?? box.pad;
  return left + ((tMs - d.tMinMs) / (d.tMaxMs - d.tMinMs)) * (box.width - left - box.pad);
}

export function yOf(gainDb: number, d: ShapeDomain, box: PlotBox): number {
  return box.pad + (gainDb / d.gainMinDb) * (box.height - 2 * box.pad);
}

/** SVG path data: the line, and the area between 0 dB and the line (the "soft fill"). */
export function shapePaths(shape: DrawnShape, d: ShapeDomain, box: PlotBox): { line: string; area: string } {
  const pts = sampleShape(shape.points).map((p) => [xOf(p.tMs, d, box), yOf(p.gainDb, d, box)] as const);
  if (!pts.length) return { line: '', area: '' };
  const f = (n: number) => n.toFixed(2);
  const line = pts.map(([x, y], i) => `${i ? 'L' : 'M'}${f(x)},${f(y)}`).join('');
  const top = yOf(0, d, box);
  const area = `M${f(pts[0][0])},${f(top)}` + pts.map(([x, y]) => `L${f(x)},${f(y)}`).join('') + `L${f(pts[pts.length - 1][0])},${f(top)}Z`;
  return { line, area };
}
