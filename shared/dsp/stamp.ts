import type { Hit } from '../schemas/hit';
import type { TuckShape } from '../schemas/tuck-shape';
import { DEFAULT_FLOOR_DB } from '../schemas/tuck-shape';
import type { GainPoint, StampResult, TuckTemplate } from './gain-curve';
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
    const g = floor;
    return { curve: { points: [{ timeSec: 0, gainDb: g }, { timeSec: durationSec, gainDb: g }], baseGainDb: base, floorDb: floor }, gatedHitIndexes, stampedHitCount: 0 };
  }

  const order: number[] = [];
  let sorted = true;
  for (let i = 0; i < hits.length; i++) {
    if (!hits[i].enabled) continue;
    if (order.length && hits[i].timeSec < hits[order[order.length - 1]].timeSec) sorted = false;
    order.push(i);
  }
  if (!sorted) order.sort((a, b) => hits[a].timeSec - hits[b].timeSec);

  const templates = new Map<number | null, TuckTemplate>();
  const templateFor = (depth: number | null): TuckTemplate => {
    let tpl = templates.get(depth);
    if (!tpl) {
      tpl = buildTuckTemplate(shape, { depthDb: depth, baseGainDb: base, rampToleranceDb: opts.rampToleranceDb });
      templates.set(depth, tpl);
    }
    return tpl;
  };

  // The curve relative to the base, in seconds, built left to right.
  const T: number[] = [];
  const G: number[] = [];
  let stampedHitCount = 0;
  for (const i of order) {
    const hit = hits[i];
    const tpl = templateFor(hit.depthDb ?? null);
    const n = tpl.tMs.length;
    if (n === 0) continue;
    const t0 = hit.timeSec + tpl.startMs / 1000;
    const t1 = hit.timeSec + tpl.endMs / 1000;
    if (opts.isBassSilent && opts.isBassSilent(Math.max(0, t0), Math.min(durationSec, t1))) {
      gatedHitIndexes.push(i);
      continue;
    }
    stampedHitCount++;
    const last = T.length - 1;
    if (last < 0 || T[last] <= t0) {
      for (let j = 0; j < n; j++) {
        const tj = hit.timeSec + tpl.tMs[j] / 1000;
        if (j === 0 && last >= 0 && T[last] === tj) continue;
        T.push(tj);
        G.push(tpl.gainDb[j]);
      }
      continue;
    }
    // Overlap: merge the tail of the curve from the last point at or before t0.
    let c = last;
    while (c > 0 && T[c] > t0) c--;
    const bT = new Array<number>(n);
    for (let j = 0; j < n; j++) bT[j] = hit.timeSec + tpl.tMs[j] / 1000;
    const merged = minMerge(T, G, c, bT, tpl.gainDb);
    T.length = c;
    G.length = c;
    for (let k = 0; k < merged.t.length; k++) {
      T.push(merged.t[k]);
      G.push(merged.g[k]);
    }
  }

  return { curve: { points: finish(T, G, base, durationSec), baseGainDb: base, floorDb: floor }, gatedHitIndexes, stampedHitCount };
}

/** Value of a piecewise-linear function (0 outside its span) at x, with a forward-moving cursor. */
function makeCursor(t: ArrayLike<number>, g: ArrayLike<number>, from: number) {
  let k = from;
  const end = t.length - 1;
  return (x: number): number => {
    if (x < t[from] || x > t[end]) return 0;
    while (k < end && t[k + 1] < x) k++;
    if (x === t[k]) return g[k];
    const span = t[k + 1] - t[k];
    return span > 0 ? g[k] + ((g[k + 1] - g[k]) * (x - t[k])) / span : g[k + 1];
  };
}

/**
 * Pointwise minimum of A = (aT, aG)[from..] and B, both piecewise linear and 0
 * outside their spans: union of breakpoints plus the crossings between them.
 */
function minMerge(aT: number[], aG: number[], from: number, bT: ArrayLike<number>, bG: ArrayLike<number>): { t: number[]; g: number[] } {
  const times: number[] = [];
  let i = from;
  let j = 0;
  while (i < aT.length || j < bT.length) {
    const x = j >= bT.length || (i < aT.length && aT[i] <= bT[j]) ? aT[i++] : bT[j++];
    if (times.length === 0 || x > times[times.length - 1]) times.push(x);
  }
  const fa = makeCursor(aT, aG, from);
  const fb = makeCursor(bT, bG, 0);
  const t: number[] = [];
  const g: number[] = [];
  let pa = fa(times[0]);
  let pb = fb(times[0]);
  t.push(times[0]);
  g.push(Math.min(pa, pb));
  for (let k = 1; k < times.length; k++) {
    const x = times[k];
    const va = fa(x);
    const vb = fb(x);
    const d0 = pa - pb;
    const d1 = va - vb;
    if ((d0 < 0 && d1 > 0) || (d0 > 0 && d1 < 0)) {
      const f = d0 / (d0 - d1);
      const xc = times[k - 1] + (x - times[k - 1]) * f;
      if (xc > t[t.length - 1] && xc < x) {
        t.push(xc);
        g.push(pa + (va - pa) * f);
      }
    }
    t.push(x);
    g.push(Math.min(va, vb));
    pa = va;
    pb = vb;
  }
  return { t, g };
}

/**
 * Relative seconds/dB arrays → absolute breakpoints over [0, durationSec]:
 * adds the base gain, clips at the song's ends (interpolating the gain there)
 * and drops the middle points of flat runs.
 */
function finish(T: number[], G: number[], base: number, durationSec: number): GainPoint[] {
  const out: GainPoint[] = [];
  const push = (timeSec: number, rel: number) => {
    const gainDb = base + rel;
    const n = out.length;
    if (n && out[n - 1].timeSec >= timeSec) return;
    if (n >= 2 && out[n - 1].gainDb === gainDb && out[n - 2].gainDb === gainDb) out[n - 1].timeSec = timeSec;
    else out.push({ timeSec, gainDb });
  };
  const at = (x: number, k: number) => {
    const span = T[k + 1] - T[k];
    return span > 0 ? G[k] + ((G[k + 1] - G[k]) * (x - T[k])) / span : G[k + 1];
  };
  push(0, T.length && T[0] <= 0 ? (T[T.length - 1] <= 0 ? 0 : at(0, firstAfter(T, 0) - 1)) : 0);
  for (let k = 0; k < T.length; k++) {
    if (T[k] <= 0) continue;
    if (T[k] >= durationSec) {
      if (k > 0 && T[k - 1] < durationSec) push(durationSec, at(durationSec, k - 1));
      break;
    }
    push(T[k], G[k]);
  }
  push(durationSec, T.length && T[T.length - 1] > durationSec ? at(durationSec, firstAfter(T, durationSec) - 1) : 0);
  if (out.length === 1) out.push({ timeSec: durationSec, gainDb: out[0].gainDb });
  return out;
}

/** Index of the first element > x (T ascending). */
function firstAfter(T: number[], x: number): number {
  let lo = 0;
  let hi = T.length;
  while (lo < hi) {
    const mid = (lo + hi) >> 1;
    if (T[mid] <= x) lo = mid + 1;
    else hi = mid;
  }
  return lo;
}
