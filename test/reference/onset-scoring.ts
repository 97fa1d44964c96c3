/**
 * MIREX-style onset scoring (REFERENCES.md, "Onsets — Scoring like MIREX"):
 * a detection within ±tolerance of a true onset is a hit, matched one to
 * one; extra detections are false positives, unmatched onsets false
 * negatives; P = TP/(TP+FP), R = TP/(TP+FN), F = 2PR/(P+R). mir_eval's
 * default window is ±50 ms; Tuckline is held to ±5 ms.
 */
export interface OnsetScore {
  tp: number;
  fp: number;
  fn: number;
  precision: number;
  recall: number;
  f: number;
  /** detected − true, seconds, per matched pair, in the order of the true onsets. */
  errorsSec: number[];
  medianAbsErrorMs: number;
  p95AbsErrorMs: number;
  /** Signed median error, ms (negative = early). */
  medianErrorMs: number;
}

/**
 * One-to-one matching: candidate pairs within the window, taken in order of
 * increasing |error| (greedy; equal to a maximum matching when true onsets are
 * more than two windows apart, as in all our fixtures).
 */
export function scoreOnsets(trueSec: readonly number[], detectedSec: readonly number[], toleranceSec = 0.005): OnsetScore {
  const pairs: Array<[number, number, number]> = [];
  let j0 = 0;
  const det = [...detectedSec].sort((a, b) => a - b);
  trueSec.forEach((t, i) => {
    while (j0 < det.length && det[j0]! < t - toleranceSec) j0++;
    for (let j = j0; j < det.length && det[j]! <= t + toleranceSec; j++) pairs.push([Math.abs(det[j]! - t), i, j]);
  });
  pairs.sort((a, b) => a[0] - b[0]);
  const usedTrue = new Set<number>();
  const usedDet = new Set<number>();
  const errorByTrue = new Map<number, number>();
  for (const [, i, j] of pairs) {
    if (usedTrue.has(i) || usedDet.has(j)) continue;
    usedTrue.add(i);
    usedDet.add(j);
    errorByTrue.set(i, det[j]! - trueSec[i]!);
  }
  const tp = usedTrue.size;
  const fp = det.length - tp;
  const fn = trueSec.length - tp;
  const precision = det.length ? tp / det.length : 0;
  const recall = trueSec.length ? tp / trueSec.length : 0;
  const f = precision + recall > 0 ? (2 * precision * recall) / (precision + recall) : 0;
  const errorsSec = [...errorByTrue.entries()].sort((a, b) => a[0] - b[0]).map(([, e]) => e);
  const abs = errorsSec.map((e) => Math.abs(e) * 1000).sort((a, b) => a - b);
  const signed = errorsSec.map((e) => e * 1000).sort((a, b) => a - b);
  return {
    tp,
    fp,
    fn,
    precision,
    recall,
    f,
    errorsSec,
    medianAbsErrorMs: quantile(abs, 0.5),
    p95AbsErrorMs: quantile(abs, 0.95),
    medianErrorMs: quantile(signed, 0.5),
  };
}

/** Linear-interpolated quantile of sorted values (NaN when empty). */
export function quantile(sorted: readonly number[], q: number): number {
  if (sorted.length === 0) return NaN;
  const pos = (sorted.length - 1) * q;
  const lo = Math.floor(pos);
  const hi = Math.ceil(pos);
  return sorted[lo]! + (sorted[hi]! - sorted[lo]!) * (pos - lo);
}
