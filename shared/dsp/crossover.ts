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
