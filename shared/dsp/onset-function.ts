/**
 * Onset function of the kick's low band: the rise of the linear-prediction
 * error. A decaying kick body is a damped sinusoid, which a short linear
 * predictor follows almost exactly; a new hit is what the predictor cannot
 * foresee, so its prediction error jumps even when the previous kick is
 * still ringing at the same level (where a plain energy rise beats and
 * misses it). Bello et al. 2005, §III-C ("prediction error" and the
 * complex-domain function compare each frame with a prediction from the
 * past), with the log compression of §III-A; our time-domain form.
 */

export interface PredictionOnsetFunction {
  /** Low-band samples per frame. */
  hopSamples: number;
  /** riseDb[n] for the frame starting at sample n·hop: max(0, 10·log10((E_after + ε) / (E_before + ε))), dB. */
  riseDb: Float32Array;
  /** innovation[n]: E_after, the mean squared prediction error over the scoring window (linear, full scale²). */
  innovation: Float64Array;
}

/** Predictor order: two damped sinusoids (a ringing tail and the one before it); the scoring loop is unrolled for it. */
const ORDER = 4;

/**
 * The running covariance sums restart from zero every this many frames (8 s
 * on the 1 ms grid): float64 sums that slide over a whole song would carry
 * their rounding from the first frame to the last, and a block that starts
 * afresh can be computed on its own (server/audio/detection-split.ts computes
 * the second half of a song on another thread with the same result).
 */
export const ONSET_BLOCK_FRAMES = 8192;

/**
 * Prediction-error onset function of `x` (the low band, ~2 kHz).
 * At each frame start s, a least-squares order-4 predictor
 * x̂[i] = Σ_{k=1..4} a_k·x[i−k] is fitted on the `fitSamples` before s
 * (covariance method, ridge 1e-6·trace); E_before is its mean squared error
 * there, E_after the mean squared error of the same predictor on the
 * `windowSamples` from s. riseDb = max(0, 10·log10((E_after + ε)/(E_before + ε))),
 * ε = (−80 dBFS)². The covariance sums slide, so the cost is O(N·order²).
 * @param x low band, linear full scale
 * @param hopSamples frame hop in samples of x
 * @param fitSamples length of the fitting window before each frame
 * @param windowSamples length of the scoring window after each frame
 */
export function predictionOnsetFunction(x: Float32Array, hopSamples: number, fitSamples: number, windowSamples: number): PredictionOnsetFunction {
  const frames = Math.ceil(x.length / hopSamples);
  const out: PredictionOnsetFunction = { hopSamples, riseDb: new Float32Array(frames), innovation: new Float64Array(frames) };
  predictionOnsetFrames(x, 0, x.length, hopSamples, fitSamples, windowSamples, 0, frames, out, 0);
  return out;
}

/**
 * Frames [frameFrom, frameTo) of the prediction-error onset function, written
 * to `out` at index frame − outFrameOffset. `x` may be a slice of the low
 * band: x[0] is low-band sample `xStart`, and `totalSamples` is the whole low
 * band's length (the frame count and the window ends are those of the whole).
 * The slice must hold every sample a frame reads: from frameFrom·hop − fit − 4
 * to the end. Sums restart at frameFrom and at each multiple of
 * ONSET_BLOCK_FRAMES, so any split on that grid gives identical figures.
 */
export function predictionOnsetFrames(
  x: Float32Array,
  xStart: number,
  totalSamples: number,
  hopSamples: number,
  fitSamples: number,
  windowSamples: number,
  frameFrom: number,
  frameTo: number,
  out: PredictionOnsetFunction,
  outFrameOffset: number,
): void {
  for (let f0 = frameFrom; f0 < frameTo; ) {
    const f1 = Math.min(frameTo, (Math.floor(f0 / ONSET_BLOCK_FRAMES) + 1) * ONSET_BLOCK_FRAMES);
    onsetBlock(x, xStart, totalSamples, hopSamples, fitSamples, windowSamples, f0, f1, out, outFrameOffset);
    f0 = f1;
  }
}

function onsetBlock(
  x: Float32Array,
  xStart: number,
  n: number,
  hopSamples: number,
  fitSamples: number,
  windowSamples: number,
  frameFrom: number,
  frameTo: number,
  out: PredictionOnsetFunction,
  outFrameOffset: number,
): void {
  const { riseDb, innovation } = out;

  const p = ORDER; // the unrolled loops below assume 4
  const epsilon = 1e-8;
  // Running sums over the fitting window of products x[i−j]·x[i−k], j,k = 0..p,
  // for i in [s − fit, s): entry (j,k) at j·(p+1)+k.
  const dim = p + 1;
  const sums = new Float64Array(dim * dim);
  // Indexes below are of the whole low band; x[i − xStart] holds sample i.
  // The sums cover i in [max(first, windowEnd − fit), windowEnd), starting empty at `first`.
  const first = Math.max(0, frameFrom * hopSamples - fitSamples);
  let windowEnd = first;
  for (let f = frameFrom; f < frameTo; f++) {
    const s = f * hopSamples;
    while (windowEnd < s) {
      // No closure here: a fresh one per block made the optimised code deoptimise at every block.
      if (windowEnd - p >= 0) addProducts(x, windowEnd - xStart, sums, 1);
      const leaving = windowEnd - fitSamples;
      if (leaving >= first && leaving - p >= 0) addProducts(x, leaving - xStart, sums, -1);
      windowEnd++;
    }
    const count = Math.max(0, Math.min(fitSamples, s - p));
    // Normal equations (C + ridge·I)·a = r with C_jk = Σ x[i−j]x[i−k], r_j = Σ x[i]x[i−j],
    // j,k = 1..4, solved by an unrolled Cholesky factorisation.
    const c11 = sums[6]!, c12 = sums[7]!, c13 = sums[8]!, c14 = sums[9]!;
    const c22 = sums[12]!, c23 = sums[13]!, c24 = sums[14]!;
    const c33 = sums[18]!, c34 = sums[19]!, c44 = sums[24]!;
    const r1 = sums[1]!, r2 = sums[2]!, r3 = sums[3]!, r4 = sums[4]!;
    const ridge = 1e-6 * (c11 + c22 + c33 + c44) + 1e-12;
    let a1 = 0, a2 = 0, a3 = 0, a4 = 0;
    const d1 = c11 + ridge;
    if (d1 > 0) {
      const l11 = Math.sqrt(d1);
      const l21 = c12 / l11, l31 = c13 / l11, l41 = c14 / l11;
      const d2 = c22 + ridge - l21 * l21;
      if (d2 > 0) {
        const l22 = Math.sqrt(d2);
        const l32 = (c23 - l31 * l21) / l22, l42 = (c24 - l41 * l21) / l22;
        const d3 = c33 + ridge - l31 * l31 - l32 * l32;
        if (d3 > 0) {
          const l33 = Math.sqrt(d3);
          const l43 = (c34 - l41 * l31 - l42 * l32) / l33;
          const d4 = c44 + ridge - l41 * l41 - l42 * l42 - l43 * l43;
          if (d4 > 0) {
            const l44 = Math.sqrt(d4);
            const y1 = r1 / l11;
            const y2 = (r2 - l21 * y1) / l22;
            const y3 = (r3 - l31 * y1 - l32 * y2) / l33;
            const y4 = (r4 - l41 * y1 - l42 * y2 - l43 * y3) / l44;
            a4 = y4 / l44;
            a3 = (y3 - l43 * a4) / l33;
            a2 = (y2 - l32 * a3 - l42 * a4) / l22;
            a1 = (y1 - l21 * a2 - l31 * a3 - l41 * a4) / l11;
          }
        }
      }
    }
    // Fit error E = c00 − 2·aᵀr + aᵀ·C·a; with (C + ridge·I)·a = r this is c00 − aᵀr − ridge·|a|².
    const err = sums[0]! - (a1 * r1 + a2 * r2 + a3 * r3 + a4 * r4) - ridge * (a1 * a1 + a2 * a2 + a3 * a3 + a4 * a4);
    const before = count > 0 ? Math.max(0, err) / count : 0;
    let after = 0;
    const end = s + windowSamples < n ? s + windowSamples : n;
    // The four previous samples ride along in locals (one load per sample; same sums in the same order).
    const i0 = (s < p ? p : s) - xStart;
    const last = end - xStart;
    if (i0 < last) {
      let m1 = x[i0 - 1]!, m2 = x[i0 - 2]!, m3 = x[i0 - 3]!, m4 = x[i0 - 4]!;
      for (let i = i0; i < last; i++) {
        const xi = x[i]!;
        const e = xi - (a1 * m1 + a2 * m2 + a3 * m3 + a4 * m4);
        after += e * e;
        m4 = m3;
        m3 = m2;
        m2 = m1;
        m1 = xi;
      }
    }
    const len = Math.max(1, end - s);
    after /= len;
    const o = f - outFrameOffset;
    innovation[o] = after;
    const r = 10 * Math.log10((after + epsilon) / (before + epsilon));
    riseDb[o] = r > 0 ? r : 0;
  }
}

/**
 * sums += sign · the 15 distinct products of x[at], x[at−1] … x[at−4]
 * (entry (j,k) at j·5 + k), unrolled for order 4; runs twice per low-band
 * sample. A module-level function, so it optimises once for every block.
 */
function addProducts(x: Float32Array, at: number, sums: Float64Array, sign: number): void {
  const x0 = x[at]!;
  const x1 = x[at - 1]!;
  const x2 = x[at - 2]!;
  const x3 = x[at - 3]!;
  const x4 = x[at - 4]!;
  sums[0]! += sign * x0 * x0;
  sums[1]! += sign * x0 * x1;
  sums[2]! += sign * x0 * x2;
  sums[3]! += sign * x0 * x3;
  sums[4]! += sign * x0 * x4;
  sums[6]! += sign * x1 * x1;
  sums[7]! += sign * x1 * x2;
  sums[8]! += sign * x1 * x3;
  sums[9]! += sign * x1 * x4;
  sums[12]! += sign * x2 * x2;
  sums[13]! += sign * x2 * x3;
  sums[14]! += sign * x2 * x4;
  sums[18]! += sign * x3 * x3;
  sums[19]! += sign * x3 * x4;
  sums[24]! += sign * x4 * x4;
}
