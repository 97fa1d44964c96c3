import { biquadLowpass, type Biquad } from './biquad';

/**
 * Sample-accurate onset by a variance change point: the Akaike Information
 * Criterion picker, AIC(k) = k·ln(var(x[a..a+k])) + (N−k)·ln(var(x[a+k..b])),
 * whose minimum is the sample where the signal's statistics change (Maeda
 * 1985, "A method for reading and checking phase times in autoprocessing
 * system of seismic wave data"; from memory; common in seismic P-wave
 * picking). A kick's energy begins at that change point, before its peak.
 */

/**
 * Scratch arrays reused from call to call: a song's refinement runs these
 * pickers a few thousand times, and fresh arrays each time kept the young
 * generation collecting every millisecond. Each function below uses its own
 * and keeps no reference past its return (JavaScript runs one call at a time
 * per thread; a worker has its own module instance).
 */
const pool = { sum: new Float64Array(0), sumSq: new Float64Array(0), err: new Float32Array(0), seg: new Float32Array(0), dec: new Float32Array(0) };
/** The normal equations' scratch by predictor order (m: p², r, lag: p + 1, coef, hist: p). */
interface SolverScratch {
  m: Float64Array;
  r: Float64Array;
  lag: Float64Array;
  coef: Float64Array;
  hist: Float64Array;
}
const solverPool = new Map<number, SolverScratch>();
function solverScratch(p: number): SolverScratch {
  let s = solverPool.get(p);
  if (!s) {
    s = { m: new Float64Array(p * p), r: new Float64Array(p), lag: new Float64Array(p + 1), coef: new Float64Array(p), hist: new Float64Array(p) };
    solverPool.set(p, s);
  }
  return s;
}
function f64(name: 'sum' | 'sumSq', n: number): Float64Array {
  if (pool[name].length < n) pool[name] = new Float64Array(Math.max(n, 2 * pool[name].length));
  return pool[name];
}
function f32(name: 'err' | 'seg' | 'dec', n: number): Float32Array {
  if (pool[name].length < n) pool[name] = new Float32Array(Math.max(n, 2 * pool[name].length));
  return pool[name].subarray(0, n);
}

/**
 * Index in [startSample, endSample) where x's variance changes most, by
 * the AIC picker above. Variances use cumulative sums in float64; a floor of
 * 1e-20 keeps ln finite in digital silence.
 * @param x signal, linear amplitude
 * @param startSample first sample of the search window
 * @param endSample one past the last sample of the window
 * @returns sample index of the change point (startSample when the window is too short)
 */
export function aicChangePoint(x: Float32Array, startSample: number, endSample: number): number {
  const a = Math.max(0, startSample);
  const b = Math.min(x.length, endSample);
  const n = b - a;
  if (n < 4) return a;
  const sum = f64('sum', n + 1);
  const sumSq = f64('sumSq', n + 1);
  sum[0] = 0;
  sumSq[0] = 0;
  for (let i = 0; i < n; i++) {
    const v = x[a + i]!;
    sum[i + 1] = sum[i]! + v;
    sumSq[i + 1] = sumSq[i]! + v * v;
  }
  const totalSum = sum[n]!;
  const totalSq = sumSq[n]!;
  // Coarse pass every `stride` samples, then every sample around the best:
  // the AIC curve is smooth at the scale of a few samples, and logs are the cost.
  const stride = Math.max(1, Math.floor(n / 512));
  let bestK = 2;
  let bestAic = Infinity;
  for (let k = 2; k <= n - 2; k += stride) {
    const v = aicAt(sum, sumSq, totalSum, totalSq, n, k);
    if (v < bestAic) {
      bestAic = v;
      bestK = k;
    }
  }
  const fineFrom = Math.max(2, bestK - stride);
  const fineTo = Math.min(n - 2, bestK + stride);
  for (let k = fineFrom; k <= fineTo; k++) {
    const v = aicAt(sum, sumSq, totalSum, totalSq, n, k);
    if (v < bestAic) {
      bestAic = v;
      bestK = k;
    }
  }
  const best = a + bestK;
  return best;
}

/**
 * AIC(k) = k·ln(var(x[0..k))) + (n−k)·ln(var(x[k..n))) from the cumulative
 * sums (sum[k] = Σ_{i<k} x[i], sumSq likewise of x²); variances floored at 1e-20.
 * A module-level function rather than a closure per call (no allocation, one optimisation).
 */
function aicAt(sum: Float64Array, sumSq: Float64Array, totalSum: number, totalSq: number, n: number, k: number): number {
  const m1 = sum[k]! / k;
  const v1 = sumSq[k]! / k - m1 * m1;
  const k2 = n - k;
  const m2 = (totalSum - sum[k]!) / k2;
  const v2 = (totalSq - sumSq[k]!) / k2 - m2 * m2;
  return k * Math.log(v1 > 1e-20 ? v1 : 1e-20) + k2 * Math.log(v2 > 1e-20 ? v2 : 1e-20);
}

/**
 * AR-AIC onset: fits a least-squares order-`order` linear predictor on the
 * `fitSamples` before `startSample` (what was sounding before the hit: a
 * ringing tail, a room, noise), runs it over [startSample, endSample), and
 * returns the AIC change point of the prediction error. The error is
 * near-white before the hit and jumps where something new begins, so a
 * low, still-ringing previous kick no longer fools the picker (Sleeman & van
 * Eck 1999, "Robust automatic P-phase picking: an on-line implementation in
 * the analysis of broadband seismogram recordings"; from memory).
 * `ridgeRelative` adds ridgeRelative·(mean energy) to the normal equations'
 * diagonal, as if white noise that much below the signal were present.
 * @returns sample index of the change point
 */
export function arAicChangePoint(x: Float32Array, startSample: number, endSample: number, fitSamples: number, order: number, ridgeRelative = 1e-3, freeRun = false): number {
  const a = Math.max(0, startSample);
  const b = Math.min(x.length, endSample);
  const fitStart = Math.max(order, a - fitSamples);
  const count = a - fitStart;
  if (count < 4 * order) return aicChangePoint(x, a, b);
  // The steps are functions of their own: each gets optimised on its own in
  // a few milliseconds, where one big body took ~60 ms to compile and ran in
  // the interpreter meanwhile (a command line runs it only a few hundred times).
  const scratch = solverScratch(order);
  fitPredictor(x, fitStart, a, order, ridgeRelative, scratch);
  const n = b - a;
  const err = f32('err', n);
  // Extrapolate what was sounding (the predictor run on its own output) and
  // subtract it: what is left before the hit is noise, after it the new hit.
  if (freeRun) freeRunError(x, a, n, order, scratch.coef, scratch.hist, err);
  else if (order === 8) predictionError8(x, a, n, scratch.coef, err);
  else predictionError(x, a, n, order, scratch.coef, err);
  return a + aicChangePoint(err, 0, n);
}

/**
 * Least-squares order-p predictor of x on [fitStart, a) into scratch.coef:
 * the covariance method's normal equations with ridgeRelative·(mean
 * diagonal) on the diagonal, solved by Cholesky.
 */
function fitPredictor(x: Float32Array, fitStart: number, a: number, p: number, ridgeRelative: number, scratch: SolverScratch): void {
  const { m, r, lag, coef } = scratch;
  // Covariance method from lagged sums: L[d] = Σ_{u∈[fitStart, a)} x[u]·x[u−d];
  // entry (j, k≥j) = Σ_u x[u−1−j]·x[u−1−k] is L[k−j] with the window shifted
  // by j+1 samples (drop j+1 terms at the end, add j+1 before the start).
  // O(count·p) instead of O(count·p²).
  for (let d = 0; d <= p; d++) {
    let sum = 0;
    for (let u = fitStart; u < a; u++) sum += x[u]! * x[u - d]!;
    lag[d] = sum;
  }
  for (let j = 0; j < p; j++) {
    r[j] = lag[j + 1]!;
    for (let k = j; k < p; k++) {
      const d = k - j;
      let v = lag[d]!;
      for (let u = a - 1 - j; u < a; u++) v -= x[u]! * x[u - d]!;
      for (let u = fitStart - 1 - j; u < fitStart; u++) v += x[u]! * x[u - d]!;
      m[j * p + k] = v;
    }
  }
  let trace = 0;
  for (let j = 0; j < p; j++) {
    for (let k = 0; k < j; k++) m[j * p + k] = m[k * p + j]!;
    trace += m[j * p + j]!;
  }
  const ridge = (ridgeRelative * trace) / p + 1e-15;
  for (let j = 0; j < p; j++) m[j * p + j]! += ridge;
  choleskySolve(m, r, coef, p);
}

/** err[i] = x[a + i] − Σ_{k<p} coef[k]·x[a + i − 1 − k] for i < n (any order; predictionError8 is this for 8). */
function predictionError(x: Float32Array, a: number, n: number, p: number, coef: Float64Array, err: Float32Array): void {
  for (let i = 0; i < n; i++) {
    let pred = 0;
    for (let k = 0; k < p; k++) pred += coef[k]! * x[a + i - 1 - k]!;
    err[i] = x[a + i]! - pred;
  }
}

/** err[i] = x[a + i] − the predictor run on its own output from the p samples before a. */
function freeRunError(x: Float32Array, a: number, n: number, p: number, coef: Float64Array, hist: Float64Array, err: Float32Array): void {
  for (let k = 0; k < p; k++) hist[k] = x[a - 1 - k]!;
  for (let i = 0; i < n; i++) {
    let pred = 0;
    for (let k = 0; k < p; k++) pred += coef[k]! * hist[k]!;
    for (let k = p - 1; k > 0; k--) hist[k] = hist[k - 1]!;
    hist[0] = pred;
    err[i] = x[a + i]! - pred;
  }
}

/**
 * err[i] = x[a + i] − Σ_{k<8} coef[k]·x[a + i − 1 − k] for i < n: the general
 * loop unrolled for the full-rate picker's order, coefficients and the eight
 * previous samples in locals, the terms added in the same order (same
 * result bit for bit). A sample's sum does not wait for the previous one's,
 * so the unrolled loop runs several samples at once.
 */
export function predictionError8(x: Float32Array, a: number, n: number, coef: Float64Array, err: Float32Array): void {
  const k0 = coef[0]!, k1 = coef[1]!, k2 = coef[2]!, k3 = coef[3]!, k4 = coef[4]!, k5 = coef[5]!, k6 = coef[6]!, k7 = coef[7]!;
  let m1 = x[a - 1]!, m2 = x[a - 2]!, m3 = x[a - 3]!, m4 = x[a - 4]!, m5 = x[a - 5]!, m6 = x[a - 6]!, m7 = x[a - 7]!, m8 = x[a - 8]!;
  for (let i = 0; i < n; i++) {
    const x0 = x[a + i]!;
    const pred = k0 * m1 + k1 * m2 + k2 * m3 + k3 * m4 + k4 * m5 + k5 * m6 + k6 * m7 + k7 * m8;
    err[i] = x0 - pred;
    m8 = m7;
    m7 = m6;
    m6 = m5;
    m5 = m4;
    m4 = m3;
    m3 = m2;
    m2 = m1;
    m1 = x0;
  }
}

/** Solves M·a = b (p×p symmetric positive-definite, row-major, overwritten) by Cholesky; zeros if not positive-definite. */
function choleskySolve(m: Float64Array, b: Float64Array, out: Float64Array, p: number): void {
  for (let j = 0; j < p; j++) {
    let d = m[j * p + j]!;
    for (let k = 0; k < j; k++) d -= m[j * p + k]! * m[j * p + k]!;
    if (!(d > 0)) {
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

/** The robust picker's rate, zero-phase low-pass, predictor order and ridge (our choices). */
const REFINE_RATE_HZ = 4000;
const REFINE_LOWPASS_HZ = 500;
const REFINE_ORDER = 4;
const REFINE_RIDGE = 1e-4;
/** Extra signal read on each side of the window by refineOnsetSample (room for the zero-phase filter), seconds. */
export const REFINE_PAD_SEC = 0.005;

/**
 * Onset of a hit in [startSample, endSample) of a full-rate signal, at the
 * resolution of a ~4 kHz copy: the window (with `fitSec` of what precedes
 * it) is low-passed without phase shift (2nd-order Butterworth at 500 Hz,
 * run forwards then backwards), decimated, and handed to the AR-AIC picker
 * (free-running extrapolation of what was sounding, then AIC of the rest).
 * At 4 kHz a kick's body is a few dozen samples per period, so the
 * predictor models it well; at 96 kHz it would whiten it away.
 * @returns full-rate sample index of the onset
 */
export function refineOnsetSample(x: Float32Array, sampleRateHz: number, startSample: number, endSample: number, fitSec: number): number {
  const factor = Math.max(1, Math.floor(sampleRateHz / REFINE_RATE_HZ));
  const pad = Math.round(REFINE_PAD_SEC * sampleRateHz);
  const fit = Math.round(fitSec * sampleRateHz);
  const segStart = Math.max(0, startSample - fit - pad);
  const segEnd = Math.min(x.length, endSample + pad);
  const seg = f32('seg', segEnd - segStart);
  const offset = (startSample - segStart) % factor;
  const dec = f32('dec', Math.floor((seg.length - offset) / factor));
  zeroPhaseDecimate(x, segStart, lowpassAt(sampleRateHz), seg, factor, offset, dec);
  const a = Math.floor((startSample - segStart - offset) / factor);
  const b = Math.floor((endSample - segStart - offset) / factor);
  const idx = arAicChangePoint(dec, a, b, Math.round(fit / factor), REFINE_ORDER, REFINE_RIDGE, true);
  return segStart + offset + idx * factor;
}

/** The robust picker's low-pass by sample rate (a song's refinement asks for the same one hundreds of times). */
const lowpassByRate = new Map<number, Biquad>();
function lowpassAt(sampleRateHz: number): Biquad {
  let lp = lowpassByRate.get(sampleRateHz);
  if (!lp) lowpassByRate.set(sampleRateHz, (lp = biquadLowpass(REFINE_LOWPASS_HZ, sampleRateHz, Math.SQRT1_2)));
  return lp;
}

/**
 * dec[j] = y[offset + j·factor], y = x[from, from + seg.length) filtered by
 * `lp` forwards and then backwards (zero phase), each pass from rest in
 * transposed direct form II with its output rounded to float32, exactly as
 * processCascadeInPlace on a copy, reversed, filtered again and reversed
 * back gives it; the backward pass runs from the end instead of reversing,
 * and keeps only the samples the decimation picks. `seg` is scratch.
 */
export function zeroPhaseDecimate(x: Float32Array, from: number, lp: Biquad, seg: Float32Array, factor: number, offset: number, dec: Float32Array): void {
  const { b0, b1, b2, a1, a2 } = lp;
  const n = seg.length;
  let z1 = 0;
  let z2 = 0;
  for (let i = 0; i < n; i++) {
    const v = x[from + i]!;
    const y = b0 * v + z1;
    z1 = b1 * v - a1 * y + z2;
    z2 = b2 * v - a2 * y;
    seg[i] = y;
  }
  z1 = 0;
  z2 = 0;
  let j = dec.length - 1;
  let pick = offset + j * factor; // the next index the decimation keeps, going down
  for (let i = n - 1; i >= 0; i--) {
    const v = seg[i]!;
    const y = b0 * v + z1;
    z1 = b1 * v - a1 * y + z2;
    z2 = b2 * v - a2 * y;
    if (i === pick) {
      dec[j--] = y;
      pick -= factor;
    }
  }
}
