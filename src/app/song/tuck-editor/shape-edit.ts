import { TuckPoint, TuckShape, tuckPointSchema } from '../../../../shared/schemas/tuck-shape';

/** Neighbouring breakpoints keep at least this much time between them, ms (the schema wants strictly rising times). */
export const MIN_POINT_GAP_MS = 0.1;
const T_MIN = tuckPointSchema.shape.tMs.minValue ?? -50;
const T_MAX = tuckPointSchema.shape.tMs.maxValue ?? 2000;
const G_MIN = tuckPointSchema.shape.gainDb.minValue ?? -120;

const round = (v: number, step: number) => Math.round(v / step) * step;

/** Rounds to 0.01 ms and 0.01 dB so typed and dragged values read cleanly. */
function tidy(p: TuckPoint): TuckPoint {
  return { ...p, tMs: +round(p.tMs, 0.01).toFixed(2), gainDb: +round(p.gainDb, 0.01).toFixed(2) };
}

/**
 * Moves one breakpoint, kept between its neighbours (so times stay strictly
 * rising) and within the schema's limits (−50…2000 ms, −120…0 dB).
 */
export function movePoint(shape: TuckShape, index: number, tMs: number, gainDb: number): TuckShape {
  const pts = shape.points;
  if (index < 0 || index >= pts.length) return shape;
  const lo = index > 0 ? pts[index - 1].tMs + MIN_POINT_GAP_MS : T_MIN;
  const hi = index < pts.length - 1 ? pts[index + 1].tMs - MIN_POINT_GAP_MS : T_MAX;
  const moved = tidy({
    ...pts[index],
    tMs: Math.min(hi, Math.max(lo, tMs)),
    gainDb: Math.min(0, Math.max(G_MIN, gainDb)),
  });
  // Rounding may touch a neighbour when the gap is at its minimum: keep the original time then.
  if (moved.tMs < lo - 1e-9 || moved.tMs > hi + 1e-9) moved.tMs = pts[index].tMs;
  return { ...shape, points: pts.map((p, i) => (i === index ? moved : p)) };
}

/** Adds a breakpoint at a time (between the two around it), returning the new shape and its index. */
export function addPoint(shape: TuckShape, tMs: number, gainDb: number): { shape: TuckShape; index: number } {
  const pts = shape.points;
  if (pts.length >= 64) return { shape, index: -1 };
  const t = Math.min(T_MAX, Math.max(T_MIN, tMs));
  if (pts.some((p) => Math.abs(p.tMs - t) < MIN_POINT_GAP_MS)) return { shape, index: -1 };
  let index = pts.findIndex((p) => p.tMs > t);
  if (index < 0) index = pts.length;
  const curve = pts[index - 1]?.curve ?? 'linear';
  const point = tidy({ tMs: t, gainDb: Math.min(0, Math.max(G_MIN, gainDb)), curve });
  return { shape: { ...shape, points: [...pts.slice(0, index), point, ...pts.slice(index)] }, index };
}

/** Removes a breakpoint; a shape keeps at least two. */
export function removePoint(shape: TuckShape, index: number): TuckShape {
  if (shape.points.length <= 2 || index < 0 || index >= shape.points.length) return shape;
  return { ...shape, points: shape.points.filter((_, i) => i !== index) };
}

/** Sets the curve of the segment that starts at this breakpoint. */
export function setSegmentCurve(shape: TuckShape, index: number, curve: 'linear' | 'smooth'): TuckShape {
  if (index < 0 || index >= shape.points.length - 1) return shape;
  return { ...shape, points: shape.points.map((p, i) => (i === index ? { ...p, curve } : p)) };
}

/** Arrow-key steps: 1 ms / 1 dB, or 0.1 ms / 0.1 dB with Shift (the fine step). */
export function keyStep(key: string, fine: boolean): { dtMs: number; dDb: number } | null {
  const s = fine ? 0.1 : 1;
  switch (key) {
    case 'ArrowLeft': return { dtMs: -s, dDb: 0 };
    case 'ArrowRight': return { dtMs: s, dDb: 0 };
    case 'ArrowUp': return { dtMs: 0, dDb: s };
    case 'ArrowDown': return { dtMs: 0, dDb: -s };
    default: return null;
  }
}
