import type { Hit } from '../schemas/hit';
import type { TuckShape } from '../schemas/tuck-shape';
import { DEFAULT_FLOOR_DB } from '../schemas/tuck-shape';
import { packedCurve, type CurveArrays, type StampResult, type TuckTemplate } from './gain-curve';
import { buildTuckTemplate } from './slope-guard';

export interface StampOptions {
  /** Song length, seconds: the curve runs from 0 to here. */
  durationSec: number;
  /** The lane's gain outside tucks, dB (default 0). */
  baseGainDb?: number;
  /** Bass gate: true when the bass is silent over the whole window [t0Sec, t1Sec]; such hits get no tuck. */
  isBassSilent?: (t0Sec: number, t1Sec: number) => boolean;
  /** Error of the straight-in-dB pieces the eases are sampled into, dB (default 0.05; renders use 0.002). */
  rampToleranceDb?: number;
}

/** A template with its times in seconds relative to the hit (tMs / 1000, divided once). */
interface SecondsTemplate {
  tSec: Float64Array;
  gainDb: Float64Array;
  startSec: number;
  endSec: number;
}

function inSeconds(tpl: TuckTemplate): SecondsTemplate {
  const tSec = new Float64Array(tpl.tMs.length);
  for (let j = 0; j < tSec.length; j++) tSec[j] = tpl.tMs[j] / 1000;
  return { tSec, gainDb: tpl.gainDb, startSec: tpl.startMs / 1000, endSec: tpl.endMs / 1000 };
}

/**
 * Stamps the tuck shape at every enabled hit (GLOSSARY "Stamp").
 *
 * g(t) = base + min(0, min_h T_h(t − t_h)), clamped at the floor, where T_h is the
 * slope-guarded template of hit h (depth = the hit's `depthDb` if set, else the
 * shape's) in dB relative to the base. Overlapping tucks therefore merge with the
 * deeper gain winning — no notch back up between close hits — and the minimum of
 * slope-capped curves is itself slope-capped (known by construction). Outside
 * tucks the curve sits at the base gain. A hit whose whole tuck window the
 * bass gate calls silent is skipped (its index goes to `gatedHitIndexes`).
 *
 * Units: seconds in and out, dB. The minimum is exact for the piecewise-linear
 * templates (crossings are solved, not sampled). Runs in O(points), one template
 * per distinct depth.
 */
export function stampHits(hits: readonly Hit[], shape: TuckShape, opts: StampOptions): StampResult {
  const base = opts.baseGainDb ?? 0;
  const floor = shape.floorDb ?? DEFAULT_FLOOR_DB;
  const durationSec = Math.max(0, opts.durationSec);
  const gatedHitIndexes: number[] = [];
  if (base <= floor) {
    const flat = { timeSec: Float64Array.of(0, durationSec), gainDb: Float64Array.of(floor, floor) };
    return { curve: packedCurve(flat, base, floor), gatedHitIndexes, stampedHitCount: 0 };
  }

  const order: number[] = [];
  let sorted = true;
  for (let i = 0; i < hits.length; i++) {
    if (!hits[i].enabled) continue;
    if (order.length && hits[i].timeSec < hits[order[order.length - 1]].timeSec) sorted = false;
    order.push(i);
  }
  if (!sorted) order.sort((a, b) => hits[a].timeSec - hits[b].timeSec);

  const templates = new Map<number | null, SecondsTemplate>();
  const templateFor = (depth: number | null): SecondsTemplate => {
    let tpl = templates.get(depth);
    if (!tpl) {
      tpl = inSeconds(buildTuckTemplate(shape, { depthDb: depth, baseGainDb: base, rampToleranceDb: opts.rampToleranceDb }));
      templates.set(depth, tpl);
    }
    return tpl;
  };

  // The curve relative to the base, in seconds, built left to right.
  const curve = new Breakpoints(order.length * 32 + 16);
  // The hit's tuck in absolute seconds, and the merged tail, while tucks overlap.
  let bT = new Float64Array(64);
  let merged = new Breakpoints(128);
  let stampedHitCount = 0;
  for (const i of order) {
    const hit = hits[i];
    const tpl = templateFor(hit.depthDb ?? null);
    const n = tpl.tSec.length;
    if (n === 0) continue;
    const t0 = hit.timeSec + tpl.startSec;
    if (opts.isBassSilent && opts.isBassSilent(Math.max(0, t0), Math.min(durationSec, hit.timeSec + tpl.endSec))) {
      gatedHitIndexes.push(i);
      continue;
    }
    stampedHitCount++;
    const last = curve.n - 1;
    if (last < 0 || curve.t[last] <= t0) {
      curve.room(n);
      const T = curve.t;
      const G = curve.g;
      let at = curve.n;
      for (let j = 0; j < n; j++) {
        const tj = hit.timeSec + tpl.tSec[j];
        if (j === 0 && last >= 0 && T[last] === tj) continue;
        T[at] = tj;
        G[at] = tpl.gainDb[j];
        at++;
      }
      curve.n = at;
      continue;
    }
    // Overlap: merge the tail of the curve from the last point at or before t0.
    let c = last;
    while (c > 0 && curve.t[c] > t0) c--;
    if (bT.length < n) bT = new Float64Array(n * 2);
    for (let j = 0; j < n; j++) bT[j] = hit.timeSec + tpl.tSec[j];
    merged.n = 0;
    minMerge(curve.t, curve.g, c, curve.n, bT, tpl.gainDb, n, merged);
    curve.n = c;
    curve.room(merged.n);
    curve.t.set(merged.t.subarray(0, merged.n), c);
    curve.g.set(merged.g.subarray(0, merged.n), c);
    curve.n = c + merged.n;
  }

  return { curve: packedCurve(finish(curve.t, curve.g, curve.n, base, durationSec), base, floor), gatedHitIndexes, stampedHitCount };
}

/** Growable parallel arrays of breakpoints (seconds, dB); `n` are in use. */
class Breakpoints {
  t: Float64Array;
  g: Float64Array;
  n = 0;
  constructor(capacity: number) {
    this.t = new Float64Array(capacity);
    this.g = new Float64Array(capacity);
  }
  /** Makes room for `extra` more points. */
  room(extra: number) {
    if (this.n + extra <= this.t.length) return;
    const cap = Math.max(this.t.length * 2, this.n + extra);
    const t = new Float64Array(cap);
    const g = new Float64Array(cap);
    t.set(this.t.subarray(0, this.n));
    g.set(this.g.subarray(0, this.n));
    this.t = t;
    this.g = g;
  }
  push(t: number, g: number) {
    if (this.n === this.t.length) this.room(1);
    this.t[this.n] = t;
    this.g[this.n] = g;
    this.n++;
  }
}

/**
 * Value at x of the piecewise-linear function (t, g)[from..end) (0 outside its
 * span), searching forward from index k (x never decreases between calls);
 * returns the value and leaves the index it stopped at in `cursor.k`.
 */
function valueAt(t: Float64Array, g: Float64Array, from: number, end: number, cursor: { k: number }, x: number): number {
  const last = end - 1;
  if (x < t[from] || x > t[last]) return 0;
  let k = cursor.k;
  while (k < last && t[k + 1] < x) k++;
  cursor.k = k;
  if (x === t[k]) return g[k];
  const span = t[k + 1] - t[k];
  return span > 0 ? g[k] + ((g[k + 1] - g[k]) * (x - t[k])) / span : g[k + 1];
}

/**
 * Pointwise minimum of A = (aT, aG)[from..aEnd) and B = (bT, bG)[0..bEnd), both
 * piecewise linear and 0 outside their spans: union of breakpoints plus the
 * crossings between them, appended to `out`.
 */
function minMerge(aT: Float64Array, aG: Float64Array, from: number, aEnd: number, bT: Float64Array, bG: Float64Array, bEnd: number, out: Breakpoints): void {
  const ca = { k: from };
  const cb = { k: 0 };
  let i = from;
  let j = 0;
  let prev = NaN;
  let pa = 0;
  let pb = 0;
  while (i < aEnd || j < bEnd) {
    const x = j >= bEnd || (i < aEnd && aT[i] <= bT[j]) ? aT[i++] : bT[j++];
    if (out.n > 0 && !(x > prev)) continue;
    const va = valueAt(aT, aG, from, aEnd, ca, x);
    const vb = valueAt(bT, bG, 0, bEnd, cb, x);
    if (out.n > 0) {
      const d0 = pa - pb;
      const d1 = va - vb;
      if ((d0 < 0 && d1 > 0) || (d0 > 0 && d1 < 0)) {
        const f = d0 / (d0 - d1);
        const xc = prev + (x - prev) * f;
        if (xc > out.t[out.n - 1] && xc < x) out.push(xc, pa + (va - pa) * f);
      }
    }
    out.push(x, Math.min(va, vb));
    prev = x;
    pa = va;
    pb = vb;
  }
}

/**
 * Relative seconds/dB arrays → absolute breakpoints over [0, durationSec]:
 * adds the base gain, clips at the song's ends (interpolating the gain there)
 * and drops the middle points of flat runs.
 */
function finish(T: Float64Array, G: Float64Array, n: number, base: number, durationSec: number): CurveArrays {
  // At most the n points, one at each end and one at the song's end.
  const out = new Breakpoints(n + 3);
  const at = (x: number, k: number) => {
    const span = T[k + 1] - T[k];
    return span > 0 ? G[k] + ((G[k + 1] - G[k]) * (x - T[k])) / span : G[k + 1];
  };
  pushPoint(out, 0, base + (n && T[0] <= 0 ? (T[n - 1] <= 0 ? 0 : at(0, firstAfter(T, n, 0) - 1)) : 0));
  for (let k = 0; k < n; k++) {
    if (T[k] <= 0) continue;
    if (T[k] >= durationSec) {
      if (k > 0 && T[k - 1] < durationSec) pushPoint(out, durationSec, base + at(durationSec, k - 1));
      break;
    }
    pushPoint(out, T[k], base + G[k]);
  }
  pushPoint(out, durationSec, base + (n && T[n - 1] > durationSec ? at(durationSec, firstAfter(T, n, durationSec) - 1) : 0));
  if (out.n === 1) out.push(durationSec, out.g[0]);
  return { timeSec: out.t.subarray(0, out.n), gainDb: out.g.subarray(0, out.n) };
}

/** Appends a breakpoint unless it is not later than the last; a flat run's last point moves instead. */
function pushPoint(out: Breakpoints, timeSec: number, gainDb: number): void {
  const n = out.n;
  if (n && out.t[n - 1] >= timeSec) return;
  if (n >= 2 && out.g[n - 1] === gainDb && out.g[n - 2] === gainDb) out.t[n - 1] = timeSec;
  else out.push(timeSec, gainDb);
}

/** Index of the first of T[0..n) > x (T ascending). */
function firstAfter(T: Float64Array, n: number, x: number): number {
  let lo = 0;
  let hi = n;
  while (lo < hi) {
    const mid = (lo + hi) >> 1;
    if (T[mid] <= x) lo = mid + 1;
    else hi = mid;
  }
  return lo;
}
