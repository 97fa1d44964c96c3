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
  /** energy[n]: mean x² of the low band over the scoring window after frame n (linear, full scale²). */
  energy: Float64Array;
  /** innovation[n]: E_after, the mean squared prediction error over the scoring window (linear, full scale²). */
  innovation: Float64Array;
}

/** Predictor order: two damped sinusoids (a ringing tail and the one before it); the scoring loop is unrolled for it. */
const ORDER = 4;

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
  const n = x.length;
  const frames = Math.ceil(n / hopSamples);
  const riseDb = new Float32Array(frames);
  const energy = new Float64Array(frames);
  const innovation = new Float64Array(frames);
  const p = ORDER; // the unrolled loops below assume 4
  const epsilon = 1e-8;
  // Running sums over the fitting window of products x[i−j]·x[i−k], j,k = 0..p,
  // for i in [s − fit, s): entry (j,k) at j·(p+1)+k.
  const dim = p + 1;
  const sums = new Float64Array(dim * dim);
  // Unrolled for order 4 (the 15 distinct products of x[i..i−4]); this loop
  // runs twice per low-band sample.
  const addTerm = (i: number, sign: number): void => {
    if (i - p < 0) return;
    const x0 = x[i]!;
    const x1 = x[i - 1]!;
    const x2 = x[i - 2]!;
    const x3 = x[i - 3]!;
    const x4 = x[i - 4]!;
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
  };
  // Index into `sums` of entry (j+1, k+1) of the normal matrix, j,k = 0..p−1 (upper triangle).
  const upper = new Int32Array(p * p);
  for (let j = 0; j < p; j++) for (let k = 0; k < p; k++) upper[j * p + k] = (Math.min(j, k) + 1) * dim + Math.max(j, k) + 1;
  const a = new Float64Array(p);
  const m = new Float64Array(p * p);
  const rhs = new Float64Array(p);
  let windowEnd = 0; // sums cover i in [windowEnd − fit, windowEnd)
  for (let f = 0; f < frames; f++) {
    const s = f * hopSamples;
    while (windowEnd < s) {
      addTerm(windowEnd, 1);
      if (windowEnd - fitSamples >= 0) addTerm(windowEnd - fitSamples, -1);
      windowEnd++;
    }
    const count = Math.max(0, Math.min(fitSamples, s - p));
    // Normal equations: Σ x[i−j]x[i−k] a_k = Σ x[i]x[i−j], j,k = 1..p.
    let trace = 0;
    for (let j = 0; j < p; j++) {
      for (let k = 0; k < p; k++) m[j * p + k] = sums[upper[j * p + k]!]!;
      rhs[j] = sums[j + 1]!;
      trace += m[j * p + j]!;
    }
    const ridge = 1e-6 * trace + 1e-12;
    for (let j = 0; j < p; j++) m[j * p + j]! += ridge;
    solveSymmetric(m, rhs, a, p);
    // Fit error from the sums: E = c00 − 2·aᵀr + aᵀ·C·a, C the unridged sums.
    let err = sums[0]!;
    for (let j = 0; j < p; j++) {
      err -= 2 * a[j]! * rhs[j]!;
      for (let k = 0; k < p; k++) err += a[j]! * a[k]! * sums[upper[j * p + k]!]!;
    }
    const before = count > 0 ? Math.max(0, err) / count : 0;
    let after = 0;
    let sig = 0;
    const end = s + windowSamples < n ? s + windowSamples : n;
    const a1 = a[0]!;
    const a2 = a[1]!;
    const a3 = a[2]!;
    const a4 = a[3]!;
    for (let i = s < p ? p : s; i < end; i++) {
      const xi = x[i]!;
      const e = xi - (a1 * x[i - 1]! + a2 * x[i - 2]! + a3 * x[i - 3]! + a4 * x[i - 4]!);
      after += e * e;
      sig += xi * xi;
    }
    const len = Math.max(1, end - s);
    after /= len;
    energy[f] = sig / len;
    innovation[f] = after;
    const r = 10 * Math.log10((after + epsilon) / (before + epsilon));
    riseDb[f] = r > 0 ? r : 0;
  }
  return { hopSamples, riseDb, energy, innovation };
}

/** Solves M·a = b for a small symmetric positive-definite M (p×p, row-major) by Cholesky; M is overwritten. */
function solveSymmetric(m: Float64Array, b: Float64Array, out: Float64Array, p: number): void {
  for (let j = 0; j < p; j++) {
    let d = m[j * p + j]!;
    for (let k = 0; k < j; k++) d -= m[j * p + k]! * m[j * p + k]!;
    if (d <= 0) {
      out.fill(0);
      return;
    }
    const l = Math.sqrt(d);
    m[j * p + j] = l;
    for (let i = j + 1; i < p; i++) {
      let s = m[i * p + j]!;
      for (let k = 0; k < j; k++) s -= m[i * p + k]! * m[j * p + k]!;
      m[i * p + j] = s / l;
    }
  }
  for (let i = 0; i < p; i++) {
    let s = b[i]!;
    for (let k = 0; k < i; k++) s -= m[i * p + k]! * out[k]!;
    out[i] = s / m[i * p + i]!;
  }
  for (let i = p - 1; i >= 0; i--) {
    let s = out[i]!;
    for (let k = i + 1; k < p; k++) s -= m[k * p + i]! * out[k]!;
    out[i] = s / m[i * p + i]!;
  }
}
