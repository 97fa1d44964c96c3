import { z } from 'zod';

/**
 * One breakpoint of a drawn tuck shape (GLOSSARY "Tuck shape"): `tMs` is
 * milliseconds relative to the hit (negative = before it), `gainDb` the gain
 * relative to the lane's base gain (≤ 0). `curve` is the segment from this
 * point to the next: 'linear' = straight in dB, 'smooth' = cosine ease in dB.
 */
export const tuckPointSchema = z.object({
  tMs: z.number().finite().min(-50).max(2000),
  gainDb: z.number().finite().min(-120).max(0),
  curve: z.enum(['linear', 'smooth']).optional(),
});
export type TuckPoint = z.infer<typeof tuckPointSchema>;

/** Default slope guard, ms: "5–10 ms fades avoid clicks" (REFERENCES.md "Gain changes and clicks", common practice). */
export const DEFAULT_SLOPE_GUARD_MS = 5;
/** Default floor, dB (GLOSSARY "Floor" example). */
export const DEFAULT_FLOOR_DB = -60;

export const tuckShapeSchema = z
  .object({
    points: z.array(tuckPointSchema).min(2).max(64),
    slopeGuardMs: z.number().min(0.5).max(50).default(DEFAULT_SLOPE_GUARD_MS),
    depthDb: z.number().min(-120).max(0).nullable().default(null),
    floorDb: z.number().min(-120).max(-6).default(DEFAULT_FLOOR_DB),
  })
  .superRefine((shape, ctx) => {
    for (let i = 1; i < shape.points.length; i++) {
      if (!(shape.points[i].tMs > shape.points[i - 1].tMs)) {
        ctx.addIssue({ code: 'custom', path: ['points', i, 'tMs'], message: 'Breakpoint times must rise strictly from one point to the next.' });
      }
    }
  });
/** A validated shape (defaults filled in). */
export type TuckShape = z.output<typeof tuckShapeSchema>;
/** A shape as written by hand or sent by the client (defaults optional). */
export type TuckShapeInput = z.input<typeof tuckShapeSchema>;

/** What the bass gate needs (GLOSSARY "Bass gate"): skip hits whose tuck window peaks below the threshold. */
export const bassGateSchema = z.object({
  enabled: z.boolean().default(true),
  /** Peak level below which the bass counts as silent, dBFS. −50 dBFS is our choice (common practice, no source). */
  thresholdDbfs: z.number().min(-120).max(0).default(-50),
});
export type BassGate = z.output<typeof bassGateSchema>;

/** One lane's stamping settings (GLOSSARY "Lane"). */
export const laneStampSchema = z.object({
  name: z.string().trim().min(1).max(120).default('Bass'),
  shape: tuckShapeSchema,
  baseGainDb: z.number().min(-60).max(24).default(0),
  gate: bassGateSchema.default({ enabled: true, thresholdDbfs: -50 }),
});
export type LaneStamp = z.output<typeof laneStampSchema>;
export type LaneStampInput = z.input<typeof laneStampSchema>;

/** The numbers the UI shows beside the drawn shape (GLOSSARY "Lead-in", "Depth", "Hold", "Recovery"). */
export interface ShapeSummary {
  /** How far before the hit the tuck begins, ms (0 when it begins at or after the hit). */
  leadInMs: number;
  /** Deepest drawn gain, dB (≤ 0). */
  depthDb: number;
  /** How long the drawn shape stays at its depth, ms. */
  holdMs: number;
  /** From the end of the hold to the last point, ms. */
  recoveryMs: number;
}

/** Points within this of the deepest gain count as "at depth" (hold). */
const AT_DEPTH_DB = 0.01;

function depthRange(points: TuckPoint[]): { first: number; last: number; depthDb: number } {
  let depthDb = 0;
  for (const p of points) depthDb = Math.min(depthDb, p.gainDb);
  let first = -1;
  let last = -1;
  points.forEach((p, i) => {
    if (p.gainDb <= depthDb + AT_DEPTH_DB) {
      if (first < 0) first = i;
      last = i;
    }
  });
  return { first, last, depthDb };
}

/**
 * Lead-in, depth, hold and recovery of a drawn shape (before the slope guard).
 * leadIn = max(0, −t₀); hold = t(last point at depth) − t(first point at depth);
 * recovery = t(last point) − t(last point at depth). Known by construction.
 */
export function describeShape(shape: Pick<TuckShapeInput, 'points'>): ShapeSummary {
  const pts = shape.points;
  const { first, last, depthDb } = depthRange(pts);
  return {
    leadInMs: Math.max(0, -pts[0].tMs),
    depthDb,
    holdMs: pts[last].tMs - pts[first].tMs,
    recoveryMs: pts[pts.length - 1].tMs - pts[last].tMs,
  };
}

/**
 * Applies numeric edits to a drawn shape and returns a new shape:
 * - depthDb scales every gain by depth/oldDepth (a flat shape gets its at-depth points set);
 * - leadInMs stretches the points up to the first at-depth point about that point;
 * - holdMs moves the points after the first at-depth point (the at-depth run stretches);
 * - recoveryMs stretches the points after the hold about its end.
 * The result keeps the points strictly ascending; validate it with `tuckShapeSchema`
 * (a lead-in too short for its points is clamped so each keeps ≥ 0.1 ms).
 */
export function reshape<S extends Pick<TuckShapeInput, 'points'>>(shape: S, patch: Partial<ShapeSummary>): S {
  let pts = shape.points.map((p) => ({ ...p }));
  const MIN_GAP_MS = 0.1;
  if (patch.depthDb !== undefined) {
    const { depthDb: old, first, last } = depthRange(pts);
    const depth = Math.min(0, patch.depthDb);
    if (old < 0) pts = pts.map((p) => ({ ...p, gainDb: p.gainDb === 0 ? 0 : (p.gainDb * depth) / old }));
    else pts = pts.map((p, i) => (i >= first && i <= last ? { ...p, gainDb: depth } : p));
  }
  const stretch = (from: number, to: number, pivotMs: number, factor: number) => {
    for (let i = from; i <= to; i++) pts[i].tMs = pivotMs + (pts[i].tMs - pivotMs) * factor;
  };
  if (patch.leadInMs !== undefined) {
    const { first } = depthRange(pts);
    const pivot = pts[first].tMs;
    const span = pivot - pts[0].tMs;
    const wantedStart = -Math.max(0, patch.leadInMs);
    const newSpan = Math.max(first * MIN_GAP_MS, pivot - wantedStart);
    if (span > 0) stretch(0, first - 1, pivot, newSpan / span);
    else if (first === 0 && newSpan > 0 && wantedStart < pivot) {
      pts.unshift({ tMs: wantedStart, gainDb: 0 });
    }
  }
  if (patch.holdMs !== undefined) {
    const { first, last } = depthRange(pts);
    const oldHold = pts[last].tMs - pts[first].tMs;
    const hold = Math.max((last - first) * MIN_GAP_MS, patch.holdMs);
    if (oldHold > 0) stretch(first + 1, last, pts[first].tMs, hold / oldHold);
    const shift = pts[first].tMs + hold - pts[last].tMs;
    for (let i = last + 1; i < pts.length; i++) pts[i].tMs += shift;
    if (last === first && hold > 0) pts.splice(first + 1, 0, { ...pts[first], tMs: pts[first].tMs + hold });
  }
  if (patch.recoveryMs !== undefined) {
    const { last } = depthRange(pts);
    const end = pts.length - 1;
    const span = pts[end].tMs - pts[last].tMs;
    const rec = Math.max((end - last) * MIN_GAP_MS, patch.recoveryMs);
    if (span > 0) stretch(last + 1, end, pts[last].tMs, rec / span);
    else if (rec > 0) pts.push({ tMs: pts[last].tMs + rec, gainDb: 0 });
  }
  return { ...shape, points: pts };
}
