import { curveArrays, packedCurve, type CurveArrays, type GainCurve } from './gain-curve';
import { amplitudeMemo } from './gain-memo';

export interface ThinOptions {
  /** Largest error allowed, dB, for linear interpolation in dB and in amplitude (default 0.5). */
  toleranceDb?: number;
  /** Errors where the true curve is at or below this level do not count, dB (default −40). */
  ignoreBelowDb?: number;
}

/** Share of the tolerance the chords may use at the curve's own points; the rest covers the stretches between them. Our choice. */
const TOLERANCE_SHARE = 0.85;

/**
 * Thins a gain curve with Ramer–Douglas–Peucker (Ramer 1972; Douglas & Peucker
 * 1973) in dB, using the vertical error instead of the perpendicular
 * distance, and accepting a chord only when BOTH ways a DAW may read it
 * stay within `toleranceDb` of every original point above `ignoreBelowDb`:
 *   straight in dB:        G_chord(u) = G_i + (G_j − G_i)·u
 *   straight in amplitude: a_chord(u) = a_i + (a_j − a_i)·u, error = |20·log10(a_chord / a_k)|
 * Where the curve crosses `ignoreBelowDb` a point is added first (on the
 * curve, exact), so the stretch above it is bounded by checked points.
 * The ends of flat runs are kept as they are (they are exact and split the
 * work into short stretches). Units: seconds and dB in and out.
 */
export function thinCurve(curve: GainCurve, opts: ThinOptions = {}): GainCurve {
  const ignoreBelowDb = opts.ignoreBelowDb ?? -40;
  const arrays = curveArrays(curve);
  const tolDb = (opts.toleranceDb ?? 0.5) * TOLERANCE_SHARE;
  const thin = arrays.timeSec.length <= 2 ? { timeSec: arrays.timeSec.slice(), gainDb: arrays.gainDb.slice() } : thinPoints(arrays, { ignoreBelowDb, db: tolDb, ratio: Math.pow(10, tolDb / 20) });
  return packedCurve(thin, curve.baseGainDb, curve.floorDb);
}

/** `thinCurve` on the arrays (at least 3 points). */
function thinPoints(points: CurveArrays, tol: Tolerance): CurveArrays {
  const d = withCrossings(points, tol.ignoreBelowDb);
  const n = d.n;
  const keep = new Uint8Array(n);
  markFlatEnds(d, keep);
  // Each stretch between kept points is thinned on its own, with an explicit stack of
  // chords (disjoint, so at most one per point of the longest stretch).
  let longest = 0;
  for (let k = 1, from = 0; k < n; k++) {
    if (!keep[k]) continue;
    if (k - from > longest) longest = k - from;
    from = k;
  }
  const stack = new Int32Array(2 * longest + 2);
  let start = 0;
  for (let k = 1; k < n; k++) {
    if (!keep[k]) continue;
    if (k - start > 1) thinStretch(d, tol, start, k, keep, stack);
    start = k;
  }
  return keptPoints(d, keep);
}

/** Marks the curve's ends and the ends of its flat runs (exact; they split the work into short stretches). */
function markFlatEnds(d: DenseCurve, keep: Uint8Array): void {
  const { g, n } = d;
  keep[0] = 1;
  keep[n - 1] = 1;
  for (let k = 1; k < n - 1; k++) if (g[k] === g[k - 1] || g[k] === g[k + 1]) keep[k] = 1;
}

interface Tolerance {
  ignoreBelowDb: number;
  /** dB, straight in dB. */
  db: number;
  /** 10^(db/20), straight in amplitude. */
  ratio: number;
}

/** RDP over the stretch [first, last] (both kept): marks in `keep` the points its chords need. */
function thinStretch(d: DenseCurve, tol: Tolerance, first: number, last: number, keep: Uint8Array, stack: Int32Array): void {
  let top = 0;
  stack[top++] = first;
  stack[top++] = last;
  while (top > 0) {
    const j = stack[--top];
    const i = stack[--top];
    const worst = worstPoint(d, tol, i, j);
    if (worst < 0) continue;
    keep[worst] = 1;
    if (worst - i > 1) {
      stack[top++] = i;
      stack[top++] = worst;
    }
    if (j - worst > 1) {
      stack[top++] = worst;
      stack[top++] = j;
    }
  }
}

/**
 * The point strictly between i and j that the chord i–j misses by most, in
 * units of the tolerance (the larger of the dB and the amplitude reading), or
 * −1 when it misses none by more than the tolerance.
 */
function worstPoint(d: DenseCurve, tol: Tolerance, i: number, j: number): number {
  const { t, g, a } = d;
  const ignoreBelow = tol.ignoreBelowDb;
  // Errors are measured in units of the tolerance: 1 = at the limit.
  const perDb = 1 / tol.db;
  const perRatio = 1 / (tol.ratio - 1);
  const span = t[j] - t[i];
  const perSec = span > 0 ? 1 / span : 0;
  const ti = t[i];
  const gi = g[i];
  const dg = g[j] - gi;
  const ai = a[i];
  const da = a[j] - ai;
  let worst = -1;
  let worstErr = 1;
  // |chord − a_m| > min(chord, a_m)·ampSlack ⇔ eAmp > worstErr, loosened by 1e-12 so
  // that only points that may beat the worst pay for the two divisions.
  let ampSlack = (tol.ratio - 1) * (1 - 1e-12);
  for (let m = i + 1; m < j; m++) {
    const gm = g[m];
    if (gm < ignoreBelow) continue;
    const u = (t[m] - ti) * perSec;
    const dDb = gi + dg * u - gm;
    const eDb = (dDb < 0 ? -dDb : dDb) * perDb;
    const chord = ai + da * u;
    const am = a[m];
    const dAmp = chord > am ? chord - am : am - chord;
    const low = chord < am ? chord : am;
    if (eDb <= worstErr && dAmp <= low * ampSlack) continue;
    // max/min − 1 = |chord − a_m| / min(chord, a_m).
    const eAmp = (dAmp / low) * perRatio;
    const e = eDb > eAmp ? eDb : eAmp;
    if (e > worstErr) {
      worstErr = e;
      worst = m;
      ampSlack = (tol.ratio - 1) * worstErr * (1 - 1e-12);
    }
  }
  return worst;
}

/** The kept points, without the middle points of flat runs (they carry nothing). */
function keptPoints(d: DenseCurve, keep: Uint8Array): CurveArrays {
  const { t, g, n } = d;
  let count = 0;
  for (let k = 0; k < n; k++) count += keep[k];
  const timeSec = new Float64Array(count);
  const gainDb = new Float64Array(count);
  let at = 0;
  // Dense indexes of the last two points kept (−1: none yet).
  let last = -1;
  let beforeLast = -1;
  for (let k = 0; k < n; k++) {
    if (!keep[k]) continue;
    if (beforeLast >= 0 && g[last] === g[k] && g[beforeLast] === g[k]) at--;
    else beforeLast = last;
    timeSec[at] = t[k];
    gainDb[at++] = g[k];
    last = k;
  }
  return { timeSec: timeSec.subarray(0, at), gainDb: gainDb.subarray(0, at) };
}

/**
 * Segments higher than this are split into pieces this high before thinning
 * (points on the curve, exact), so chords are checked along them and not only
 * at their ends: read straight in amplitude, a straight-in-dB piece of D dB
 * is off by at most 20·log10((1 + 10^(D/20))/2) − D/2 = 0.062 dB at D = 2 dB,
 * which the 15 % of the tolerance chords leave free covers (0.075 dB of 0.5).
 */
const MAX_PIECE_DB = 2;

/** The curve to thin, as arrays: time (s), gain (dB) and amplitude 10^(G/20). */
interface DenseCurve {
  t: Float64Array;
  g: Float64Array;
  a: Float64Array;
  n: number;
}

/** Dense points up to which one set of arrays is kept from call to call (24 MB of them); longer curves get their own. */
const KEPT_DENSE_POINTS = 1 << 20;
let keptDense = { t: new Float64Array(0), g: new Float64Array(0), a: new Float64Array(0) };

/**
 * Arrays for `cap` dense points, whose contents the caller overwrites. One set is
 * kept and reused: a song's are megabytes, and V8 answers that much new
 * ArrayBuffer memory, call after call, with full garbage collections (an export
 * of the bench song allocated ~13 MB; in a process holding decoded stems each
 * collection took ~5 ms). Thinning never calls out while it uses them, and
 * its result is copied out of them (`keptPoints`).
 */
function denseArrays(cap: number): { t: Float64Array; g: Float64Array; a: Float64Array } {
  if (cap > KEPT_DENSE_POINTS) return { t: new Float64Array(cap), g: new Float64Array(cap), a: new Float64Array(cap) };
  if (keptDense.t.length < cap) {
    const size = Math.min(KEPT_DENSE_POINTS, Math.max(cap, keptDense.t.length * 2));
    keptDense = { t: new Float64Array(size), g: new Float64Array(size), a: new Float64Array(size) };
  }
  return keptDense;
}

/**
 * The curve with a point added wherever a segment crosses `levelDb` and every
 * `MAX_PIECE_DB` along high segments (straight in dB, so exact), as arrays.
 */
function withCrossings(points: CurveArrays, levelDb: number): DenseCurve {
  const T = points.timeSec;
  const G = points.gainDb;
  const count = T.length;
  // At most: every point, the inner points of each segment's pieces and a crossing where one crosses the level.
  let cap = count;
  for (let k = 0; k + 1 < count; k++) {
    const dG = G[k + 1] - G[k];
    if (dG !== 0) cap += Math.ceil(Math.abs(dG) / MAX_PIECE_DB) - 1 + ((G[k] - levelDb) * (G[k + 1] - levelDb) < 0 ? 1 : 0);
  }
  const { t, g, a } = denseArrays(cap);
  const memo = amplitudeMemo();
  let n = 0;
  for (let k = 0; k < count; k++) {
    const pt = T[k];
    const pg = G[k];
    t[n] = pt;
    g[n] = pg;
    a[n++] = memo.of(pg);
    if (k + 1 === count) break;
    const qt = T[k + 1];
    const qg = G[k + 1];
    const dG = qg - pg;
    if (dG === 0) continue;
    const span = qt - pt;
    const pieces = Math.ceil(Math.abs(dG) / MAX_PIECE_DB);
    const crossing = (pg - levelDb) * (qg - levelDb) < 0 ? (levelDb - pg) / dG : 2;
    let crossed = crossing > 1;
    for (let j = 1; j <= pieces; j++) {
      const u = j / pieces;
      if (!crossed && crossing <= u) {
        crossed = true;
        const time = pt + span * crossing;
        if (time > t[n - 1] && time < qt && crossing < u) {
          t[n] = time;
          g[n] = levelDb;
          a[n++] = memo.of(levelDb);
        }
      }
      if (j === pieces) break;
      const time = pt + span * u;
      if (time > t[n - 1] && time < qt) {
        const gain = pg + dG * u;
        t[n] = time;
        g[n] = gain;
        a[n++] = memo.of(gain);
      }
    }
  }
  return { t, g, a, n };
}
