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
export function movingMedian(values: Float32Array, radius: number, stride = 50): Float32Array {
  const n = values.length;
  const out = new Float32Array(n);
  const scratch = new Float32Array(2 * radius + 1);
  for (let centre = 0; centre < n; centre += stride) {
    const lo = Math.max(0, centre - radius);
    const hi = Math.min(n, centre + radius + 1);
    const window = scratch.subarray(0, hi - lo);
    window.set(values.subarray(lo, hi));
    window.sort();
    const median = window[window.length >> 1]!;
    out.fill(median, centre, Math.min(n, centre + stride));
  }
  return out;
}

/**
 * Frames n where values[n] is the maximum of values[n−radius..n+radius]
 * (first of a plateau) and values[n] ≥ δ + λ·median[n].
 * @param values onset function (here dB of rise)
 * @param deltaFixed δ, same units as values
 * @param lambda λ, weight of the moving median (dimensionless)
 * @param medianRadius half-width of the median window, frames
 * @param peakRadius half-width of the local-maximum window, frames
 */
export function pickPeaks(values: Float32Array, deltaFixed: number, lambda: number, medianRadius: number, peakRadius: number): number[] {
  const median = movingMedian(values, medianRadius);
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
