import { biquadHighpass, biquadLowpass, cascadeState, processCascadeInPlace, type Biquad } from './biquad';

/**
 * Linkwitz–Riley 4th-order crossover: each output is a 2nd-order Butterworth
 * (Q = 1/√2) applied twice. Both outputs are −6.02 dB at the crossover, in
 * phase with each other, and sum to an all-pass with flat magnitude
 * (Linkwitz, JAES 24(1), 1976, from memory; Lipshitz & Vanderkooy, AES
 * preprint 1801, 1981).
 */
export function linkwitzRiley4(crossoverHz: number, sampleRateHz: number): { low: Biquad[]; high: Biquad[] } {
  const q = Math.SQRT1_2;
  const lp = biquadLowpass(crossoverHz, sampleRateHz, q);
  const hp = biquadHighpass(crossoverHz, sampleRateHz, q);
  return { low: [lp, lp], high: [hp, hp] };
}

/** A running band split: feed blocks in order, get the low and high bands of each. */
export function createBandSplitter(crossoverHz: number, sampleRateHz: number) {
  const { low, high } = linkwitzRiley4(crossoverHz, sampleRateHz);
  const lowState = cascadeState(low);
  const highState = cascadeState(high);
  return {
    /** Writes the bands of `block` into `lowOut` and `highOut` (same length as the block). */
    split(block: Float32Array, lowOut: Float32Array, highOut: Float32Array): void {
      lowOut.set(block);
      highOut.set(block);
      processCascadeInPlace(low, lowState, lowOut);
      processCascadeInPlace(high, highState, highOut);
    },
  };
}

/**
 * The low band of `linkwitzRiley4` alone, for whole signals: what
 * `createBandSplitter(…).split` writes to `lowOut`, sample for sample (each
 * section's output rounded to 32 bits before the next, as there), without
 * computing the high band. Signals are filtered two at a time in one loop,
 * because each section waits on its own previous output and two independent
 * signals keep the processor busy in about the time of one.
 * @param inputs one Float32Array per signal, linear amplitude
 * @param crossoverHz crossover frequency, Hz
 * @param sampleRateHz sample rate, Hz
 * @param outputs one buffer per input, as long as it (an input itself filters in place)
 * @returns the low bands (`outputs`)
 */
export function linkwitzRiley4LowBands(inputs: readonly Float32Array[], crossoverHz: number, sampleRateHz: number, outputs: Float32Array[] = inputs.map((x) => new Float32Array(x.length))): Float32Array[] {
  const [lp] = linkwitzRiley4(crossoverHz, sampleRateHz).low;
  for (let s = 0; s + 1 < inputs.length; s += 2) {
    lowPassPair(lp, inputs[s], outputs[s], inputs[s + 1], outputs[s + 1]);
  }
  if (inputs.length % 2) lowPassPair(lp, inputs[inputs.length - 1], outputs[inputs.length - 1], new Float32Array(0), new Float32Array(0));
  return outputs;
}

/**
 * Two passes of `lp` (transposed direct form II, as shared/dsp/biquad.ts) over
 * x into y and over u into v, in one loop while both last; then the longer alone.
 */
function lowPassPair(lp: Biquad, x: Float32Array, y: Float32Array, u: Float32Array, v: Float32Array): void {
  const { b0, b1, b2, a1, a2 } = lp;
  let p1 = 0, p2 = 0, q1 = 0, q2 = 0;
  let r1 = 0, r2 = 0, t1 = 0, t2 = 0;
  const both = Math.min(x.length, u.length);
  for (let i = 0; i < both; i++) {
    const xi = x[i];
    const first = b0 * xi + p1;
    p1 = b1 * xi - a1 * first + p2;
    p2 = b2 * xi - a2 * first;
    const mid = Math.fround(first);
    const out = b0 * mid + q1;
    q1 = b1 * mid - a1 * out + q2;
    q2 = b2 * mid - a2 * out;
    y[i] = out;
    const ui = u[i];
    const firstU = b0 * ui + r1;
    r1 = b1 * ui - a1 * firstU + r2;
    r2 = b2 * ui - a2 * firstU;
    const midU = Math.fround(firstU);
    const outU = b0 * midU + t1;
    t1 = b1 * midU - a1 * outU + t2;
    t2 = b2 * midU - a2 * outU;
    v[i] = outU;
  }
  if (x.length > both) lowPassRest(lp, x, y, both, p1, p2, q1, q2);
  if (u.length > both) lowPassRest(lp, u, v, both, r1, r2, t1, t2);
}

/** The rest of one signal from `from` on, carrying the two sections' state. */
function lowPassRest(lp: Biquad, x: Float32Array, y: Float32Array, from: number, p1: number, p2: number, q1: number, q2: number): void {
  const { b0, b1, b2, a1, a2 } = lp;
  for (let i = from; i < x.length; i++) {
    const xi = x[i];
    const first = b0 * xi + p1;
    p1 = b1 * xi - a1 * first + p2;
    p2 = b2 * xi - a2 * first;
    const mid = Math.fround(first);
    const out = b0 * mid + q1;
    q1 = b1 * mid - a1 * out + q2;
    q2 = b2 * mid - a2 * out;
    y[i] = out;
  }
}
