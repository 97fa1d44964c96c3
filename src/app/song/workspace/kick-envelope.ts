import { StemOverview } from '../../../../shared/schemas/stem';

export interface EnvelopePoint {
  /** ms relative to the hit. */
  tMs: number;
  /** Mean peak amplitude across the hits, normalised so the loudest bucket is 1. */
  gainDb: number;
}

/**
 * The kick's averaged envelope around its hits, from the finest overview level:
 * for each bucket offset from −fromMs to +toMs, the mean over the hits of the
 * bucket's peak |amplitude|, normalised to 1. It shows the engineer how long the
 * kick really lasts next to the drawn tuck. Resolution: one overview bucket
 * (256 samples ≈ 5.3 ms at 48 kHz).
 */
export function averagedKickEnvelope(overview: StemOverview, hitTimesSec: readonly number[], fromMs = 20, toMs = 250): EnvelopePoint[] | null {
  const level = [...overview.levels].sort((a, b) => a.samplesPerBucket - b.samplesPerBucket)[0];
  if (!level || !hitTimesSec.length) return null;
  const bucketSec = level.samplesPerBucket / overview.sampleRateHz;
  const n = level.peaks.length / 2;
  const k0 = -Math.ceil(fromMs / 1000 / bucketSec);
  const k1 = Math.ceil(toMs / 1000 / bucketSec);
  const sums = new Float64Array(k1 - k0 + 1);
  const counts = new Uint32Array(k1 - k0 + 1);
  for (const t of hitTimesSec) {
    const centre = Math.floor(t / bucketSec);
    for (let k = k0; k <= k1; k++) {
      const i = centre + k;
      if (i < 0 || i >= n) continue;
      sums[k - k0] += Math.max(Math.abs(level.peaks[2 * i]), Math.abs(level.peaks[2 * i + 1]));
      counts[k - k0]++;
    }
  }
  let max = 0;
  const mean = Array.from(sums, (s, j) => (counts[j] ? s / counts[j] : 0));
  for (const v of mean) max = Math.max(max, v);
  if (max <= 0) return null;
  return mean.map((v, j) => ({ tMs: (k0 + j) * bucketSec * 1000, gainDb: v / max }));
}
