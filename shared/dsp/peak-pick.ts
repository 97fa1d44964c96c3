/**
 * Peak picking on an onset function: local maxima above an adaptive
 * threshold δ + λ·median (Bello et al. 2005, §IV-B, moving-median threshold;
 * Dixon 2006, local-maximum condition).
 */

/**
 * Moving median of `values` over ±`radius` frames, evaluated every `stride`
 * frames and held in between (a median changes slowly; computing it on a
 * coarse grid keeps the cost at N/stride small sorts).
 * @returns one median per frame, same units as `values`
 */
export function movingMedian(values: Float32Array, radius: number, stride = MEDIAN_STRIDE): Float32Array {
  const n = values.length;
  const out = new Float32Array(n);
  movingMedianInto(values, 0, n, radius, stride, 0, n, out, 0);
  return out;
}

/** Grid of the moving median, frames. */
export const MEDIAN_STRIDE = 50;

/**
 * Part of movingMedian: the medians of the grid centres in [centreFrom,
 * centreTo), each held over its `stride` frames, written to out[frame −
 * outStart]. `values` may be a slice: values[0] is frame `valuesStart` of an
 * onset function of `n` frames, and must cover each centre's window. Any
 * partition of the centres gives movingMedian's values exactly (each median
 * is computed on its own), so two threads can share the work.
 */
export function movingMedianInto(
  values: Float32Array,
  valuesStart: number,
  n: number,
  radius: number,
  stride: number,
  centreFrom: number,
  centreTo: number,
  out: Float32Array,
  outStart: number,
): void {
  const first = Math.ceil(centreFrom / stride) * stride;
  const end = Math.min(n, centreTo);
  if (first >= end) return;
  const scratch = new Float64Array(2 * radius + 1);
  // zeros[i − spanLo] = how many of values' frames spanLo … i − 1 are 0. A
  // short loop of its own: it optimises at once, and the centres' loop then
  // does little per centre.
  const spanLo = Math.max(0, first - radius);
  const spanHi = Math.min(n, end - 1 + radius + 1);
  const zeros = zeroCounts(values, spanLo - valuesStart, spanHi - valuesStart);
  for (let centre = first; centre < end; centre += stride) {
    const lo = Math.max(0, centre - radius);
    const hi = Math.min(n, centre + radius + 1);
    const len = hi - lo;
    const k = len >> 1;
    // An onset function of rises is zero wherever nothing rises, often for
    // most of a window: with more than k zeros the k-th smallest is 0
    // (fewer than len − k ≤ k + 1 values are left to sit below them), and no
    // selection is needed.
    let median = 0;
    if (zeros[hi - spanLo]! - zeros[lo - spanLo]! <= k) {
      for (let i = 0; i < len; i++) scratch[i] = values[lo - valuesStart + i]!;
      median = selectKth(scratch, len, k);
    }
    out.fill(median, centre - outStart, Math.min(n, centre + stride) - outStart);
  }
}

/** Running counts of zeros in values[from, to), reused from call to call (one call at a time per thread). */
let zeroStore = new Int32Array(0);
function zeroCounts(values: Float32Array, from: number, to: number): Int32Array {
  if (zeroStore.length < to - from + 1) zeroStore = new Int32Array(to - from + 1);
  const counts = zeroStore;
  let count = 0;
  counts[0] = 0;
  for (let i = from; i < to; i++) {
    if (values[i] === 0) count++;
    counts[i - from + 1] = count;
  }
  return counts;
}

/**
 * The k-th smallest of a[0..len) (Hoare's quickselect, middle pivot; a is
 * reordered). The same value a full sort would put at index k, in O(len).
 */
function selectKth(a: Float64Array, len: number, k: number): number {
  let left = 0;
  let right = len - 1;
  while (left < right) {
    const pivot = a[(left + right) >> 1]!;
    let i = left;
    let j = right;
    while (i <= j) {
      while (a[i]! < pivot) i++;
      while (a[j]! > pivot) j--;
      if (i <= j) {
        const t = a[i]!;
        a[i] = a[j]!;
        a[j] = t;
        i++;
        j--;
      }
    }
    if (k <= j) right = j;
    else if (k >= i) left = i;
    else return a[k]!;
  }
  return a[k]!;
}

/**
 * Frames n where values[n] is the maximum of values[n−radius..n+radius]
 * (first of a plateau) and values[n] ≥ δ + λ·median[n].
 * @param values onset function (here dB of rise)
 * @param deltaFixed δ, same units as values
 * @param lambda λ, weight of the moving median (dimensionless)
 * @param medianRadius half-width of the median window, frames
 * @param peakRadius half-width of the local-maximum window, frames
 * @param median movingMedian(values, medianRadius), when already computed
 */
export function pickPeaks(
  values: Float32Array,
  deltaFixed: number,
  lambda: number,
  medianRadius: number,
  peakRadius: number,
  median: Float32Array = movingMedian(values, medianRadius),
): number[] {
  const peaks: number[] = [];
  const n = values.length;
  for (let i = 0; i < n; i++) {
    const v = values[i]!;
    if (v < deltaFixed + lambda * median[i]!) continue;
    let isMax = true;
    for (let j = Math.max(0, i - peakRadius); j <= Math.min(n - 1, i + peakRadius); j++) {
      const w = values[j]!;
      if (w > v || (w === v && j < i)) {
        isMax = false;
        break;
      }
    }
    if (isMax) peaks.push(i);
  }
  return peaks;
}
