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
 * The prefix sums restart from zero every this many frames (8 s
 * on the 1 ms grid): float64 prefix sums over a whole song would carry
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
 * ε = (−80 dBFS)². Every sum comes from prefix sums of lagged products, so
 * the cost is O(N·order) plus a 4×4 solve per frame.
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
  const p = ORDER; // the unrolled code below assumes 4
  // Every sum the predictor needs is a windowed sum of lagged products,
  // Σ_{j∈[A,B)} x[j−u]·x[j−v] = Λ_d(B−u) − Λ_d(A−u) with d = v − u and the
  // lag prefix sums Λ_d(i) = Σ_{k<i} x[k]·x[k−d], d = 0..4: five products a
  // sample instead of sliding fifteen in and out, and no predictor run over
  // the scoring window. Positions are of the whole low band; x[k − xStart]
  // holds sample k. The prefix sums start afresh at `base` for each block,
  // so no rounding carries past a block; a term whose lagged sample lies
  // before `base` counts as zero, and no window a frame reads contains one.
  const first = Math.max(0, frameFrom * hopSamples - fitSamples);
  const base = Math.max(0, first - p);
  const last = Math.min(n, (frameTo - 1) * hopSamples + windowSamples);
  const prefix = lagPrefixSums(x, xStart, base, last);
  scoreFrames(prefix, base, first, n, hopSamples, fitSamples, windowSamples, frameFrom, frameTo, out, outFrameOffset);
}

/** Lags of the prefix sums: 0..ORDER, the stride of a position in the prefix array. */
const LAGS = ORDER + 1;

/** The prefix-sum array, reused from block to block (one call at a time per thread). */
let prefixStore = new Float64Array(0);

/**
 * Λ_d(i) for i in [base, last] at (i − base)·5 + d: Λ_d(base) = 0 and
 * Λ_d(i + 1) = Λ_d(i) + x[i]·x[i − d], the term zero when i − d < base.
 * Its own small function: a short loop with five sums compiles in a few
 * milliseconds, which matters to a command that runs once.
 */
function lagPrefixSums(x: Float32Array, xStart: number, base: number, last: number): Float64Array {
  const need = (last - base + 1) * LAGS;
  if (prefixStore.length < need) prefixStore = new Float64Array(need);
  const out = prefixStore;
  let l0 = 0, l1 = 0, l2 = 0, l3 = 0, l4 = 0;
  let m1 = 0, m2 = 0, m3 = 0, m4 = 0;
  out[0] = 0; out[1] = 0; out[2] = 0; out[3] = 0; out[4] = 0;
  for (let i = base, o = LAGS; i < last; i++, o += LAGS) {
    const x0 = x[i - xStart]!;
    l0 += x0 * x0;
    l1 += x0 * m1;
    l2 += x0 * m2;
    l3 += x0 * m3;
    l4 += x0 * m4;
    out[o] = l0; out[o + 1] = l1; out[o + 2] = l2; out[o + 3] = l3; out[o + 4] = l4;
    m4 = m3;
    m3 = m2;
    m2 = m1;
    m1 = x0;
  }
  return out;
}

/**
 * The frames of one block from the lag prefix sums (see onsetBlock): fit the
 * predictor on [max(first, s − fit, 4), s), score it on [max(s, 4), end).
 */
function scoreFrames(
  P: Float64Array,
  base: number,
  first: number,
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
  const p = ORDER;
  const epsilon = 1e-8;
  // Offsets of the positions B − u, u = 1..4, from B's.
  const u1 = LAGS, u2 = 2 * LAGS, u3 = 3 * LAGS, u4 = 4 * LAGS;
  for (let f = frameFrom; f < frameTo; f++) {
    const s = f * hopSamples;
    const end = s + windowSamples < n ? s + windowSamples : n;
    // The window [fitFrom, fitTo): no sample before the fifth has four before it.
    const fitTo = s > p ? s : p;
    let fitFrom = s - fitSamples > first ? s - fitSamples : first;
    if (fitFrom < p) fitFrom = p;
    if (fitFrom > fitTo) fitFrom = fitTo;
    const b = (fitTo - base) * LAGS;
    const a = (fitFrom - base) * LAGS;
    // Fit window sums: C_jk = Σ x[i−j]x[i−k], r_j = Σ x[i]x[i−j], c00 = Σ x[i]².
    const c00 = P[b]! - P[a]!;
    const r1 = P[b + 1]! - P[a + 1]!, r2 = P[b + 2]! - P[a + 2]!, r3 = P[b + 3]! - P[a + 3]!, r4 = P[b + 4]! - P[a + 4]!;
    const c11 = P[b - u1]! - P[a - u1]!, c12 = P[b - u1 + 1]! - P[a - u1 + 1]!;
    const c13 = P[b - u1 + 2]! - P[a - u1 + 2]!, c14 = P[b - u1 + 3]! - P[a - u1 + 3]!;
    const c22 = P[b - u2]! - P[a - u2]!, c23 = P[b - u2 + 1]! - P[a - u2 + 1]!, c24 = P[b - u2 + 2]! - P[a - u2 + 2]!;
    const c33 = P[b - u3]! - P[a - u3]!, c34 = P[b - u3 + 1]! - P[a - u3 + 1]!;
    const c44 = P[b - u4]! - P[a - u4]!;
    const count = Math.max(0, Math.min(fitSamples, s - p));
    // Normal equations (C + ridge·I)·a = r, j,k = 1..4, solved by an unrolled
    // LDLᵀ factorisation (Cholesky without its square roots) that multiplies
    // by the pivots' reciprocals: four divisions a frame and no square root,
    // the slowest chain of the frame.
    const ridge = 1e-6 * (c11 + c22 + c33 + c44) + 1e-12;
    let a1 = 0, a2 = 0, a3 = 0, a4 = 0;
    const d1 = c11 + ridge;
    if (d1 > 0) {
      const i1 = 1 / d1;
      const l21 = c12 * i1, l31 = c13 * i1, l41 = c14 * i1;
      const d2 = c22 + ridge - l21 * c12;
      if (d2 > 0) {
        const i2 = 1 / d2;
        const e32 = c23 - l31 * c12, e42 = c24 - l41 * c12; // L32·D2, L42·D2
        const l32 = e32 * i2, l42 = e42 * i2;
        const d3 = c33 + ridge - l31 * c13 - l32 * e32;
        if (d3 > 0) {
          const i3 = 1 / d3;
          const e43 = c34 - l41 * c13 - l42 * e32; // L43·D3
          const l43 = e43 * i3;
          const d4 = c44 + ridge - l41 * c14 - l42 * e42 - l43 * e43;
          if (d4 > 0) {
            const z2 = r2 - l21 * r1;
            const z3 = r3 - l31 * r1 - l32 * z2;
            const z4 = r4 - l41 * r1 - l42 * z2 - l43 * z3;
            a4 = z4 / d4;
            a3 = z3 * i3 - l43 * a4;
            a2 = z2 * i2 - l32 * a3 - l42 * a4;
            a1 = r1 * i1 - l21 * a2 - l31 * a3 - l41 * a4;
          }
        }
      }
    }
    // Fit error E = c00 − 2·aᵀr + aᵀ·C·a; with (C + ridge·I)·a = r this is c00 − aᵀr − ridge·|a|².
    const err = c00 - (a1 * r1 + a2 * r2 + a3 * r3 + a4 * r4) - ridge * (a1 * a1 + a2 * a2 + a3 * a3 + a4 * a4);
    const before = count > 0 ? Math.max(0, err) / count : 0;
    // The same predictor's squared error over the scoring window [max(s, 4), end):
    // Σ (x[i] − aᵀm)² = W00 − 2·aᵀW0 + aᵀ·W·a with that window's sums W.
    const e = (end - base) * LAGS;
    const g = ((s > p ? s : p) - base) * LAGS;
    const w00 = P[e]! - P[g]!;
    const w01 = P[e + 1]! - P[g + 1]!, w02 = P[e + 2]! - P[g + 2]!, w03 = P[e + 3]! - P[g + 3]!, w04 = P[e + 4]! - P[g + 4]!;
    const w11 = P[e - u1]! - P[g - u1]!, w12 = P[e - u1 + 1]! - P[g - u1 + 1]!;
    const w13 = P[e - u1 + 2]! - P[g - u1 + 2]!, w14 = P[e - u1 + 3]! - P[g - u1 + 3]!;
    const w22 = P[e - u2]! - P[g - u2]!, w23 = P[e - u2 + 1]! - P[g - u2 + 1]!, w24 = P[e - u2 + 2]! - P[g - u2 + 2]!;
    const w33 = P[e - u3]! - P[g - u3]!, w34 = P[e - u3 + 1]! - P[g - u3 + 1]!;
    const w44 = P[e - u4]! - P[g - u4]!;
    const cross = a1 * w01 + a2 * w02 + a3 * w03 + a4 * w04;
    const quad =
      a1 * (a1 * w11 + 2 * (a2 * w12 + a3 * w13 + a4 * w14)) +
      a2 * (a2 * w22 + 2 * (a3 * w23 + a4 * w24)) +
      a3 * (a3 * w33 + 2 * a4 * w34) +
      a4 * a4 * w44;
    const sq = w00 - 2 * cross + quad;
    const after = sq > 0 ? sq / Math.max(1, end - s) : 0;
    const o = f - outFrameOffset;
    innovation[o] = after;
    // No rise (the error did not grow) needs no logarithm.
    riseDb[o] = after > before ? 10 * Math.log10((after + epsilon) / (before + epsilon)) : 0;
  }
}
