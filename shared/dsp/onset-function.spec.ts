import { describe, expect, it } from 'vitest';
import { ONSET_BLOCK_FRAMES, predictionOnsetFrames, predictionOnsetFunction, type PredictionOnsetFunction } from './onset-function';
import { mulberry32 } from './prng';

/**
 * The definition in onset-function.ts, computed the plain way for one frame:
 * direct sums over the fit window, a general Gaussian elimination, the
 * predictor run sample by sample over the scoring window. The fast path
 * (lag prefix sums, unrolled Cholesky, the error as a quadratic form) must
 * agree with it to rounding.
 */
function plainFrame(x: Float32Array, s: number, fit: number, window: number, first: number): { riseDb: number; innovation: number } {
  const p = 4;
  const n = x.length;
  const from = Math.max(first, s - fit, p);
  const c = Array.from({ length: p + 1 }, () => new Array<number>(p + 1).fill(0));
  for (let i = from; i < s; i++) for (let j = 0; j <= p; j++) for (let k = 0; k <= p; k++) c[j]![k]! += x[i - j]! * x[i - k]!;
  let trace = 0;
  for (let j = 1; j <= p; j++) trace += c[j]![j]!;
  const ridge = 1e-6 * trace + 1e-12;
  // (C + ridge·I)·a = r by Gaussian elimination with partial pivoting.
  const m = Array.from({ length: p }, (_, j) => [...c[j + 1]!.slice(1).map((v, k) => v + (j === k ? ridge : 0)), c[0]![j + 1]!]);
  for (let col = 0; col < p; col++) {
    let pivot = col;
    for (let r = col + 1; r < p; r++) if (Math.abs(m[r]![col]!) > Math.abs(m[pivot]![col]!)) pivot = r;
    [m[col], m[pivot]] = [m[pivot]!, m[col]!];
    for (let r = col + 1; r < p; r++) {
      const f = m[r]![col]! / m[col]![col]!;
      for (let k = col; k <= p; k++) m[r]![k]! -= f * m[col]![k]!;
    }
  }
  const a = new Array<number>(p).fill(0);
  for (let r = p - 1; r >= 0; r--) {
    let v = m[r]![p]!;
    for (let k = r + 1; k < p; k++) v -= m[r]![k]! * a[k]!;
    a[r] = v / m[r]![r]!;
  }
  const count = Math.max(0, Math.min(fit, s - p));
  let fitErr = 0;
  for (let i = from; i < s; i++) {
    let e = x[i]!;
    for (let k = 1; k <= p; k++) e -= a[k - 1]! * x[i - k]!;
    fitErr += e * e;
  }
  const end = Math.min(n, s + window);
  let after = 0;
  for (let i = Math.max(s, p); i < end; i++) {
    let e = x[i]!;
    for (let k = 1; k <= p; k++) e -= a[k - 1]! * x[i - k]!;
    after += e * e;
  }
  after /= Math.max(1, end - s);
  // The fast path measures the fit error through the ridge-regularised normal equations; the direct
  // sum above differs from it by ridge·|a|² at most, far below the tolerance used.
  const before = count > 0 ? fitErr / count : 0;
  const rise = 10 * Math.log10((after + 1e-8) / (before + 1e-8));
  return { riseDb: rise > 0 ? rise : 0, innovation: after };
}

/** Decaying 55 Hz hits at 2 kHz (a kick's low band), one every 0.4 s at random levels, over low noise. */
function lowBand(n: number, seed: number): Float32Array {
  const rnd = mulberry32(seed);
  const x = new Float32Array(n);
  let level = 0.5;
  for (let i = 0; i < n; i++) {
    const t = (i % 800) / 2000;
    if (i % 800 === 0) level = 0.05 + 0.9 * rnd();
    x[i] = level * Math.exp(-t * 9) * Math.sin(2 * Math.PI * 55 * t) + 1e-3 * (rnd() - 0.5);
  }
  return x;
}

describe('prediction-error onset function', () => {
  const hop = 2;
  const fit = 40;
  const window = 20;

  it('equals the plain computation of its definition at every frame', () => {
    const x = lowBand(20000, 7);
    const odf = predictionOnsetFunction(x, hop, fit, window);
    let worstRise = 0;
    let worstInnovation = 0;
    let rising = 0;
    for (let f = 0; f < odf.riseDb.length; f++) {
      // Each block restarts its sums at its first frame's fit window.
      const first = Math.max(0, Math.floor(f / ONSET_BLOCK_FRAMES) * ONSET_BLOCK_FRAMES * hop - fit);
      const want = plainFrame(x, f * hop, fit, window, first);
      worstRise = Math.max(worstRise, Math.abs(odf.riseDb[f]! - want.riseDb));
      worstInnovation = Math.max(worstInnovation, Math.abs(odf.innovation[f]! - want.innovation) / (want.innovation + 1e-9));
      if (want.riseDb > 10) rising++;
    }
    expect(worstRise).toBeLessThan(1e-3);
    expect(worstInnovation).toBeLessThan(1e-5);
    // Not vacuous: every hit rises well above the ringing before it.
    expect(rising).toBeGreaterThanOrEqual(20000 / 800 - 1);
  });

  it('gives the same frames when computed from a slice of the band, from a block boundary on', () => {
    const x = lowBand(3 * ONSET_BLOCK_FRAMES * hop + 999, 11);
    const whole = predictionOnsetFunction(x, hop, fit, window);
    const frameFrom = ONSET_BLOCK_FRAMES * 2;
    const xStart = frameFrom * hop - fit - 4;
    const frames = whole.riseDb.length;
    const part: PredictionOnsetFunction = { hopSamples: hop, riseDb: new Float32Array(frames - frameFrom), innovation: new Float64Array(frames - frameFrom) };
    predictionOnsetFrames(x.subarray(xStart), xStart, x.length, hop, fit, window, frameFrom, frames, part, frameFrom);
    expect(Array.from(part.riseDb)).toEqual(Array.from(whole.riseDb.subarray(frameFrom)));
    expect(Array.from(part.innovation)).toEqual(Array.from(whole.innovation.subarray(frameFrom)));
  });
});
