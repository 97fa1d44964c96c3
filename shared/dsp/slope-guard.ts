import type { TuckShape } from '../schemas/tuck-shape';
import { DEFAULT_FLOOR_DB, DEFAULT_SLOPE_GUARD_MS } from '../schemas/tuck-shape';
import type { TuckTemplate } from './gain-curve';

/**
 * The slope guard (GLOSSARY "Slope guard"): no part of a tuck may change
 * faster than a full swing between the base gain and the floor in
 * `slopeGuardMs`. We hold that in both readings of "gain":
 *   in dB:        |dG/dt| ≤ |floor − base| / slopeGuardMs                   (dB/ms)
 *   in amplitude: |da/dt| ≤ |10^(base/20) − 10^(floor/20)| / slopeGuardMs   (1/ms)
 * The dB cap keeps deep ramps from diving through the floor at once; the
 * amplitude cap is the one clicks answer to (a shallow −6 dB tuck squeezed to
 * 0.8 ms by the dB cap alone splatters at −54 dB on a 110 Hz sine, measured here).
 *
 * Guarded ramps ("eases") are a cosine ease, (1 − cos πu)/2, in a warped
 * level y(a) = ln a below the crossover amplitude c = capAmp / capNeper and
 * y(a) = ln c + (a − c)/c above it (a = 10^(G/20), relative to the base).
 * Below c the ramp is a cosine in dB, above c it is a raised cosine in
 * amplitude; dy/da is continuous at c. With dy/dt ≤ capNeper both caps hold
 * at once, and the ramp's slope is zero at both ends in dB and in amplitude.
 * Why not plain shapes (REFERENCES.md "Gain changes and clicks"): a ramp
 * linear in dB clicks at its corners; a raised cosine in amplitude has an
 * unbounded dB slope near the floor; a cosine in dB bunches its amplitude
 * change at the top and needs 13.7 ms for 40 dB at the default caps (this ease
 * 10.0 ms, including `GUARD_MARGIN`).
 */

/** Default error of the straight-in-dB pieces a stamped ease is sampled into, dB. */
export const DEFAULT_RAMP_TOLERANCE_DB = 0.05;

/**
 * A drawn 'linear' (straight in dB) segment has corners at both ends; it is kept
 * only while the amplitude slope at its top corner is at most this fraction of
 * the amplitude cap (and its dB slope within the dB cap), otherwise it becomes
 * an ease. Measured here: a 60 dB straight-in-dB ramp of 40 ms (corner slope
 * ≈ 0.17/ms) splatters at −69 dB at 55 Hz, 20 ms at −64 dB; a quarter of the
 * default cap (0.05/ms) keeps corners near −80 dB (extrapolated at 6 dB per
 * doubling of length). Our choice.
 */
export const LINEAR_CORNER_FRACTION = 0.25;

/**
 * Eases are made this much longer than the caps' minimum, so that a render,
 * which reads straight-in-dB pieces between the ease's samples, stays under
 * the amplitude cap too: a piece of ΔG dB overshoots the ease's amplitude
 * slope at its top end by about K·ΔG/2, and render-precision pieces are kept
 * at most `RENDER_MAX_PIECE_DB` high (K·0.3/2 ≈ 1.7 %). Our choice.
 */
export const GUARD_MARGIN = 1.02;
/** Highest straight-in-dB piece when sampling at render precision (tolerance ≤ 0.01 dB), dB. */
export const RENDER_MAX_PIECE_DB = 0.3;

/** dB → amplitude slope factor: d(10^(G/20))/dG = a·ln(10)/20. */
const K = Math.LN10 / 20;

export interface GuardOptions {
  /** Overrides the shape's depth (a hit's own depth), dB ≤ 0; null/undefined = the shape's. */
  depthDb?: number | null;
  /** The lane's base gain, dB (the swing is measured from it to the floor). */
  baseGainDb?: number;
}

export interface GuardedPoint {
  /** ms relative to the hit. */
  tMs: number;
  /** dB relative to the base gain. */
  gainDb: number;
  /** The segment to the next point. */
  curve: 'linear' | 'smooth';
}

export interface SlopeCaps {
  /** dB per ms. */
  dbPerMs: number;
  /** Amplitude (relative to the base gain) per ms. */
  ampPerMs: number;
  /** Floor relative to the base gain, dB. */
  floorRelDb: number;
  /** Crossover amplitude of the ease's warp, c = ampPerMs / (dbPerMs·ln10/20). */
  crossover: number;
}

/** The caps of a lane (see the top of this file). */
export function slopeCaps(shape: Pick<TuckShape, 'slopeGuardMs' | 'floorDb'>, baseGainDb = 0): SlopeCaps {
  const guardMs = shape.slopeGuardMs ?? DEFAULT_SLOPE_GUARD_MS;
  const floorRelDb = (shape.floorDb ?? DEFAULT_FLOOR_DB) - baseGainDb;
  const dbPerMs = Math.abs(floorRelDb) / guardMs;
  const ampPerMs = Math.abs(1 - Math.pow(10, floorRelDb / 20)) / guardMs;
  return { dbPerMs, ampPerMs, floorRelDb, crossover: ampPerMs / (dbPerMs * K) };
}

/** Warped level y of a gain G dB (relative), see the top of this file. */
function warp(gDb: number, c: number): number {
  const a = Math.pow(10, gDb / 20);
  return a <= c ? Math.log(a) : Math.log(c) + (a - c) / c;
}

/** Inverse of `warp`, dB. */
function unwarp(y: number, c: number): number {
  const lc = Math.log(c);
  return y <= lc ? (20 * y) / Math.LN10 : 20 * Math.log10(c * (1 + y - lc));
}

/** Cosine ease u ∈ [0,1] → [0,1]: (1 − cos πu)/2. */
export function cosineEase(u: number): number {
  return (1 - Math.cos(Math.PI * u)) / 2;
}

/**
 * Gain of the guarded ease from g0 to g1 dB at u ∈ [0, 1], dB:
 * G(u) = y⁻¹(y(g0) + (y(g1) − y(g0))·(1 − cos πu)/2).
 */
export function easeDb(g0: number, g1: number, u: number, caps: Pick<SlopeCaps, 'crossover'>): number {
  if (u <= 0) return g0;
  if (u >= 1) return g1;
  const y0 = warp(g0, caps.crossover);
  const y1 = warp(g1, caps.crossover);
  return unwarp(y0 + (y1 - y0) * cosineEase(u), caps.crossover);
}

/**
 * Shortest duration, ms, an ease from g0 to g1 dB may take under both caps:
 * T = GUARD_MARGIN · π·|y(g1) − y(g0)| / (2·capNeper), capNeper = capDb·ln10/20
 * (the ease's peak dy/dt is π·Δy/(2T)). Known by construction.
 */
export function minEaseMs(g0: number, g1: number, caps: SlopeCaps): number {
  if (g0 === g1) return 0;
  return (GUARD_MARGIN * Math.PI * Math.abs(warp(g1, caps.crossover) - warp(g0, caps.crossover))) / (2 * caps.dbPerMs * K);
}

function valueOnSegment(a: GuardedPoint, b: GuardedPoint, tMs: number, caps: SlopeCaps): number {
  const u = (tMs - a.tMs) / (b.tMs - a.tMs);
  return a.curve === 'smooth' ? easeDb(a.gainDb, b.gainDb, u, caps) : a.gainDb + (b.gainDb - a.gainDb) * u;
}

/**
 * Applies the slope guard to a drawn shape and returns its guarded breakpoints
 * (ms relative to the hit, dB relative to the base gain).
 * 1. Depth: gains scale by depth/deepest when a depth is set.
 * 2. Floor: gains below floor − base are written as floor − base.
 * 3. A segment across the hit is split at t = 0, so the gain at the hit stays as drawn.
 * 4. The tuck starts and ends at the base gain (0 dB relative): ramps are added if the drawn ends are below it.
 * 5. Each changing segment becomes an ease at least `minEaseMs` long, unless it is
 *    'linear' and gentle (see `LINEAR_CORNER_FRACTION`). Widening keeps the point at
 *    the hit (t = 0) fixed: segments before it grow earlier (longer lead-in),
 *    segments after it grow later (longer recovery), so the bottom never moves later.
 */
export function guardShape(shape: TuckShape, opts: GuardOptions = {}): GuardedPoint[] {
  const caps = slopeCaps(shape, opts.baseGainDb ?? 0);
  if (caps.floorRelDb >= 0) return [];
  let pts: GuardedPoint[] = shape.points.map((p) => ({ tMs: p.tMs, gainDb: p.gainDb, curve: p.curve ?? 'linear' }));
  const depth = opts.depthDb ?? shape.depthDb ?? null;
  const deepest = Math.min(...pts.map((p) => p.gainDb));
  if (depth !== null && deepest < 0) pts = pts.map((p) => ({ ...p, gainDb: (p.gainDb * depth) / deepest }));
  pts = pts.map((p) => ({ ...p, gainDb: Math.max(p.gainDb, caps.floorRelDb) }));
  if (pts.every((p) => p.gainDb >= 0)) return [];

  const split: GuardedPoint[] = [];
  for (let i = 0; i < pts.length; i++) {
    split.push(pts[i]);
    const next = pts[i + 1];
    if (next && pts[i].tMs < 0 && next.tMs > 0) split.push({ tMs: 0, gainDb: valueOnSegment(pts[i], next, 0, caps), curve: pts[i].curve });
  }
  pts = split;

  let anchor = pts.findIndex((p) => p.tMs === 0);
  if (anchor < 0) anchor = pts[0].tMs > 0 ? 0 : pts.length - 1;
  if (pts[0].gainDb < 0) {
    pts.unshift({ tMs: pts[0].tMs, gainDb: 0, curve: 'smooth' });
    anchor++;
  }
  const last = pts[pts.length - 1];
  if (last.gainDb < 0) {
    last.curve = 'smooth';
    pts.push({ tMs: last.tMs, gainDb: 0, curve: 'linear' });
  }

  const durations: number[] = [];
  for (let k = 0; k + 1 < pts.length; k++) {
    const a = pts[k];
    const b = pts[k + 1];
    const d = b.tMs - a.tMs;
    const dG = b.gainDb - a.gainDb;
    if (dG === 0) {
      a.curve = 'linear';
      durations.push(d);
      continue;
    }
    if (a.curve === 'linear' && d > 0) {
      const rateDb = Math.abs(dG) / d;
      const cornerAmp = Math.pow(10, Math.max(a.gainDb, b.gainDb) / 20) * K * rateDb;
      if (rateDb <= caps.dbPerMs && cornerAmp <= LINEAR_CORNER_FRACTION * caps.ampPerMs) {
        durations.push(d);
        continue;
      }
    }
    a.curve = 'smooth';
    durations.push(Math.max(d, minEaseMs(a.gainDb, b.gainDb, caps)));
  }
  for (let k = anchor - 1; k >= 0; k--) pts[k].tMs = pts[k + 1].tMs - durations[k];
  for (let k = anchor; k + 1 < pts.length; k++) pts[k + 1].tMs = pts[k].tMs + durations[k];
  pts[pts.length - 1].curve = 'linear';
  return pts.filter((p, i) => i === 0 || p.tMs > pts[i - 1].tMs || p.gainDb !== pts[i - 1].gainDb);
}

/**
 * Samples one ease into straight-in-dB pieces by bisection in u until each
 * chord is within `tolDb` of the ease at its midpoint and quarter points
 * (the ease is smooth and monotone, so that bounds the chord error; known by
 * construction), and at render precision until each piece is at most
 * `RENDER_MAX_PIECE_DB` high. Pushes the interior and end points, not the start.
 */
function sampleEase(a: GuardedPoint, b: GuardedPoint, caps: SlopeCaps, tolDb: number, t: number[], g: number[]): void {
  const f = (u: number) => easeDb(a.gainDb, b.gainDb, u, caps);
  const maxPieceDb = tolDb <= 0.01 ? RENDER_MAX_PIECE_DB : Infinity;
  const rec = (u0: number, g0: number, u1: number, g1: number, depth: number) => {
    const um = (u0 + u1) / 2;
    const gm = f(um);
    const ok =
      depth >= 14 ||
      (Math.abs(g1 - g0) <= maxPieceDb &&
        Math.abs(gm - (g0 + g1) / 2) <= tolDb &&
        Math.abs(f((u0 + um) / 2) - (3 * g0 + g1) / 4) <= tolDb &&
        Math.abs(f((um + u1) / 2) - (g0 + 3 * g1) / 4) <= tolDb);
    if (ok && depth >= 1) {
      t.push(a.tMs + (b.tMs - a.tMs) * u1);
      g.push(g1);
      return;
    }
    rec(u0, g0, um, gm, depth + 1);
    rec(um, gm, u1, g1, depth + 1);
  };
  rec(0, a.gainDb, 1, b.gainDb, 0);
}

/**
 * The guarded shape sampled for stamping (ms relative to the hit, dB relative
 * to the base): eases become straight-in-dB pieces within `rampToleranceDb`
 * (default `DEFAULT_RAMP_TOLERANCE_DB`) of the ease.
 */
export function buildTuckTemplate(shape: TuckShape, opts: GuardOptions & { rampToleranceDb?: number } = {}): TuckTemplate {
  const pts = guardShape(shape, opts);
  const caps = slopeCaps(shape, opts.baseGainDb ?? 0);
  const tol = opts.rampToleranceDb ?? DEFAULT_RAMP_TOLERANCE_DB;
  const t: number[] = [];
  const g: number[] = [];
  for (let k = 0; k < pts.length; k++) {
    const a = pts[k];
    if (k === 0) {
      t.push(a.tMs);
      g.push(a.gainDb);
    }
    const b = pts[k + 1];
    if (!b) break;
    if (a.curve === 'smooth' && b.tMs > a.tMs) sampleEase(a, b, caps, tol, t, g);
    else if (b.tMs > t[t.length - 1]) {
      t.push(b.tMs);
      g.push(b.gainDb);
    }
  }
  return {
    tMs: Float64Array.from(t),
    gainDb: Float64Array.from(g),
    startMs: t.length ? t[0] : 0,
    endMs: t.length ? t[t.length - 1] : 0,
  };
}
