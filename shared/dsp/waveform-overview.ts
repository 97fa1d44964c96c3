/** Min/max peaks of a signal at one zoom level. */
export interface OverviewLevel {
  /** Samples of the source per bucket. */
  samplesPerBucket: number;
  /** Interleaved [min0, max0, min1, max1, …], each in −1..1 (full scale). */
  peaks: Float32Array;
}

export interface WaveformOverview {
  sampleRateHz: number;
  frames: number;
  levels: OverviewLevel[];
}

/**
 * Min/max peaks per bucket at several zoom levels, so a long stem draws at once
 * at any zoom (each pixel column shows the extremes of the samples under it —
 * the usual way to draw a waveform without aliasing it away; common practice, no source).
 * Each level is computed from the one below it, so the whole pyramid costs one pass.
 *
 * @param mono samples in −1..1
 * @param sampleRateHz the signal's rate, kept for converting buckets to seconds
 * @param samplesPerBucket ascending bucket sizes; each must be a multiple of the previous
 */
export function waveformOverview(mono: Float32Array, sampleRateHz: number, samplesPerBucket: number[] = [256, 2048, 16384]): WaveformOverview {
  const levels: OverviewLevel[] = [];
  let previous: OverviewLevel | undefined;
  for (const size of samplesPerBucket) {
    const buckets = Math.max(1, Math.ceil(mono.length / size));
    const peaks = new Float32Array(buckets * 2);
    if (!previous) {
      for (let b = 0; b < buckets; b++) {
        let lo = 0;
        let hi = 0;
        const end = Math.min(mono.length, (b + 1) * size);
        for (let i = b * size; i < end; i++) {
          const v = mono[i];
          if (v < lo) lo = v;
          if (v > hi) hi = v;
        }
        peaks[2 * b] = lo;
        peaks[2 * b + 1] = hi;
      }
    } else {
      const ratio = size / previous.samplesPerBucket;
      if (!Number.isInteger(ratio)) throw new Error('Each bucket size must be a multiple of the previous one.');
      const src = previous.peaks;
      const srcBuckets = src.length / 2;
      for (let b = 0; b < buckets; b++) {
        let lo = 0;
        let hi = 0;
        const end = Math.min(srcBuckets, (b + 1) * ratio);
        for (let i = b * ratio; i < end; i++) {
          if (src[2 * i] < lo) lo = src[2 * i];
          if (src[2 * i + 1] > hi) hi = src[2 * i + 1];
        }
        peaks[2 * b] = lo;
        peaks[2 * b + 1] = hi;
      }
    }
    previous = { samplesPerBucket: size, peaks };
    levels.push(previous);
  }
  return { sampleRateHz, frames: mono.length, levels };
}
