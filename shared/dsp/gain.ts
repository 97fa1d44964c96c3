import type { GainCurve } from './gain-curve';

/**
 * Decibels to linear amplitude gain: g = 10^(dB/20). Source: the definition of
 * the decibel for field (amplitude) quantities, IEC 60027-3.
 */
export function dbToGain(db: number): number {
  return Math.pow(10, db / 20);
}

/**
 * Linear amplitude gain to decibels: dB = 20·log10(g); g ≤ 0 gives -Infinity.
 * Source: as `dbToGain`.
 */
export function gainToDb(gain: number): number {
  return gain > 0 ? 20 * Math.log10(gain) : -Infinity;
}

/**
 * The curve's gain in dB at `timeSec` (seconds): linear interpolation in dB
 * between the breakpoints around it, held flat before the first and after the
 * last. Known by construction (that is what a breakpoint curve means here).
 */
export function gainDbAt(curve: GainCurve, timeSec: number): number {
  const p = curve.points;
  if (p.length === 0) return curve.baseGainDb ?? 0;
  if (timeSec <= p[0].timeSec) return p[0].gainDb;
  const last = p.length - 1;
  if (timeSec >= p[last].timeSec) return p[last].gainDb;
  let lo = 0;
  let hi = last;
  while (hi - lo > 1) {
    const mid = (lo + hi) >> 1;
    if (p[mid].timeSec <= timeSec) lo = mid;
    else hi = mid;
  }
  const a = p[lo];
  const b = p[hi];
  const span = b.timeSec - a.timeSec;
  if (span <= 0) return b.gainDb;
  return a.gainDb + ((b.gainDb - a.gainDb) * (timeSec - a.timeSec)) / span;
}

/**
 * Samples the curve once per sample as linear amplitude gain:
 * out[i] = 10^(g((startFrame + i) / sampleRateHz) / 20), g interpolated
 * linearly in dB. Inside a segment the amplitude is an exponential in n, so it
 * is computed by a running product (one `Math.pow` per segment, not per
 * sample), re-anchored at every breakpoint so rounding cannot drift.
 * @param frames number of samples to produce
 * @param sampleRateHz samples per second
 * @param out optional output buffer (length ≥ frames), reused in hot loops
 * @param startFrame index of the first sample (for block-wise rendering)
 */
export function sampleGainCurve(curve: GainCurve, frames: number, sampleRateHz: number, out?: Float32Array, startFrame = 0): Float32Array {
  const gains = out ?? new Float32Array(frames);
  const p = curve.points;
  if (p.length === 0) {
    gains.fill(dbToGain(curve.baseGainDb ?? 0), 0, frames);
    return gains;
  }
  const endFrame = startFrame + frames;
  let n = startFrame;
  const firstEnd = Math.min(endFrame, Math.max(n, Math.ceil(p[0].timeSec * sampleRateHz)));
  gains.fill(dbToGain(p[0].gainDb), 0, firstEnd - startFrame);
  n = firstEnd;
  let i = 0;
  if (n < endFrame) {
    // First segment whose end lies after n.
    let lo = 0;
    let hi = p.length - 1;
    while (lo < hi) {
      const mid = (lo + hi) >> 1;
      if (Math.ceil(p[mid + 1].timeSec * sampleRateHz) <= n) lo = mid + 1;
      else hi = mid;
    }
    i = lo;
  }
  for (; i + 1 < p.length && n < endFrame; i++) {
    const a = p[i];
    const b = p[i + 1];
    const segEnd = Math.min(endFrame, Math.ceil(b.timeSec * sampleRateHz));
    if (segEnd <= n) continue;
    const span = b.timeSec - a.timeSec;
    if (a.gainDb === b.gainDb || span <= 0) {
      gains.fill(dbToGain(b.gainDb), n - startFrame, segEnd - startFrame);
      n = segEnd;
      continue;
    }
    const dbPerSample = (b.gainDb - a.gainDb) / (span * sampleRateHz);
    let g = dbToGain(a.gainDb + dbPerSample * (n - a.timeSec * sampleRateHz));
    const ratio = Math.pow(10, dbPerSample / 20);
    for (; n < segEnd; n++) {
      gains[n - startFrame] = g;
      g *= ratio;
    }
  }
  if (n < endFrame) gains.fill(dbToGain(p[p.length - 1].gainDb), n - startFrame, frames);
  return gains;
}

/**
 * Multiplies every channel by the curve, sample by sample (rendering a ducked
 * stem): y_c[n] = x_c[n] · 10^(g(n/fs)/20). Returns new arrays unless `inPlace`.
 */
export function applyGainCurve(channels: Float32Array[], sampleRateHz: number, curve: GainCurve, inPlace = false): Float32Array[] {
  const frames = channels.length > 0 ? channels[0].length : 0;
  const gains = sampleGainCurve(curve, frames, sampleRateHz);
  return channels.map((x) => {
    const y = inPlace ? x : new Float32Array(frames);
    for (let n = 0; n < frames; n++) y[n] = x[n] * gains[n];
    return y;
  });
}
