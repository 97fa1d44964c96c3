/** An averaged kick, aligned on its onsets, for drawing under the tuck shape. */
export interface AverageKick {
  /** Time of the first value relative to the hit, ms (negative = before). */
  startMs: number;
  /** Spacing of the values, ms. */
  stepMs: number;
  /** Mean of the aligned waveforms (a coherent picture of the kick), −1..1. */
  mean: number[];
  /** RMS across the aligned waveforms at each step (its envelope), 0..1. */
  rms: number[];
  hitCount: number;
}

/**
 * Averages the kick around each onset: for every hit, the samples from
 * `beforeMs` before to `afterMs` after, summed sample by sample; the mean and
 * the RMS over hits are then decimated to `stepMs` (peak-preserving: the value
 * of largest magnitude in each step). Kicks from one sample are near-identical,
 * so the mean shows the kick's real length; the RMS survives varied timbres.
 */
export function averageKick(mono: Float32Array, sampleRateHz: number, hitTimesSec: readonly number[], beforeMs = 20, afterMs = 300, stepMs = 0.5, maxHits = 400): AverageKick {
  const before = Math.round((beforeMs / 1000) * sampleRateHz);
  const after = Math.round((afterMs / 1000) * sampleRateHz);
  const length = before + after;
  const sum = new Float64Array(length);
  const sumSq = new Float64Array(length);
  // Evenly spread hits when there are many: the average converges long before 400.
  const stride = Math.max(1, Math.ceil(hitTimesSec.length / maxHits));
  let count = 0;
  for (let h = 0; h < hitTimesSec.length; h += stride) {
    const start = Math.round(hitTimesSec[h] * sampleRateHz) - before;
    for (let i = 0; i < length; i++) {
      const j = start + i;
      const v = j >= 0 && j < mono.length ? mono[j] : 0;
      sum[i] += v;
      sumSq[i] += v * v;
    }
    count++;
  }
  const per = Math.max(1, Math.round((stepMs / 1000) * sampleRateHz));
  const mean: number[] = [];
  const rms: number[] = [];
  for (let i = 0; i < length; i += per) {
    let m = 0;
    let r = 0;
    for (let k = i; k < Math.min(length, i + per); k++) {
      const mv = count ? sum[k] / count : 0;
      const rv = count ? Math.sqrt(sumSq[k] / count) : 0;
      if (Math.abs(mv) > Math.abs(m)) m = mv;
      if (rv > r) r = rv;
    }
    mean.push(Math.round(m * 1e4) / 1e4);
    rms.push(Math.round(r * 1e4) / 1e4);
  }
  return { startMs: -beforeMs, stepMs: (per / sampleRateHz) * 1000, mean, rms, hitCount: count };
}
