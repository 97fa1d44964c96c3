/**
 * Second-order IIR sections (biquads) and Butterworth cascades of them.
 * Coefficients from R. Bristow-Johnson, "Cookbook formulae for audio EQ
 * biquad filter coefficients" (W3C Audio EQ Cookbook; from memory).
 */

/** Normalised coefficients (a0 = 1) of y[n] = b0·x[n] + b1·x[n−1] + b2·x[n−2] − a1·y[n−1] − a2·y[n−2]. */
export interface Biquad {
  b0: number;
  b1: number;
  b2: number;
  a1: number;
  a2: number;
}

/**
 * RBJ low-pass: w0 = 2π·f0/fs, α = sin(w0)/(2Q);
 * b = ((1−cos w0)/2, 1−cos w0, (1−cos w0)/2), a = (1+α, −2cos w0, 1−α), divided by a0.
 * @param cutoffHz −3 dB point for Q = 1/√2
 * @param sampleRateHz sample rate in Hz
 * @param q quality factor (dimensionless)
 */
export function biquadLowpass(cutoffHz: number, sampleRateHz: number, q: number): Biquad {
  const w0 = (2 * Math.PI * cutoffHz) / sampleRateHz;
  const cos = Math.cos(w0);
  const alpha = Math.sin(w0) / (2 * q);
  const a0 = 1 + alpha;
  return {
    b0: (1 - cos) / 2 / a0,
    b1: (1 - cos) / a0,
    b2: (1 - cos) / 2 / a0,
    a1: (-2 * cos) / a0,
    a2: (1 - alpha) / a0,
  };
}

/** RBJ high-pass: b = ((1+cos w0)/2, −(1+cos w0), (1+cos w0)/2), a as the low-pass. Units as biquadLowpass. */
export function biquadHighpass(cutoffHz: number, sampleRateHz: number, q: number): Biquad {
  const w0 = (2 * Math.PI * cutoffHz) / sampleRateHz;
  const cos = Math.cos(w0);
  const alpha = Math.sin(w0) / (2 * q);
  const a0 = 1 + alpha;
  return {
    b0: (1 + cos) / 2 / a0,
    b1: -(1 + cos) / a0,
    b2: (1 + cos) / 2 / a0,
    a1: (-2 * cos) / a0,
    a2: (1 - alpha) / a0,
  };
}

/**
 * Butterworth section Qs for an even order N: Q_k = 1 / (2·cos((2k−1)·π/(2N))), k = 1..N/2
 * (pole angles of the Butterworth polynomial; standard filter design, e.g.
 * 4th order → 0.5412, 1.3066).
 */
export function butterworthQs(order: number): number[] {
  const qs: number[] = [];
  for (let k = 1; k <= order / 2; k++) qs.push(1 / (2 * Math.cos(((2 * k - 1) * Math.PI) / (2 * order))));
  return qs;
}

/** An even-order Butterworth low-pass as a cascade of RBJ sections; −3 dB at cutoffHz. */
export function biquadLowpassCascade(cutoffHz: number, sampleRateHz: number, order: number): Biquad[] {
  return butterworthQs(order).map((q) => biquadLowpass(cutoffHz, sampleRateHz, q));
}

/** An even-order Butterworth high-pass as a cascade of RBJ sections; −3 dB at cutoffHz. */
export function biquadHighpassCascade(cutoffHz: number, sampleRateHz: number, order: number): Biquad[] {
  return butterworthQs(order).map((q) => biquadHighpass(cutoffHz, sampleRateHz, q));
}

/** Two state values per section (transposed direct form II), zero = at rest. */
export function cascadeState(sections: readonly Biquad[]): Float64Array {
  return new Float64Array(sections.length * 2);
}

/**
 * Runs `samples` through the cascade in place, transposed direct form II,
 * carrying `state` so consecutive blocks filter as one signal.
 * Units: whatever `samples` holds (linear amplitude); the filter is linear.
 */
export function processCascadeInPlace(sections: readonly Biquad[], state: Float64Array, samples: Float32Array): void {
  const n = samples.length;
  for (let s = 0; s < sections.length; s++) {
    const { b0, b1, b2, a1, a2 } = sections[s]!;
    let z1 = state[2 * s]!;
    let z2 = state[2 * s + 1]!;
    for (let i = 0; i < n; i++) {
      const x = samples[i]!;
      const y = b0 * x + z1;
      z1 = b1 * x - a1 * y + z2;
      z2 = b2 * x - a2 * y;
      samples[i] = y;
    }
    state[2 * s] = z1;
    state[2 * s + 1] = z2;
  }
}

/** Convenience: a filtered copy of `samples` through a fresh cascade. */
export function filterCascade(sections: readonly Biquad[], samples: Float32Array): Float32Array {
  const out = Float32Array.from(samples);
  processCascadeInPlace(sections, cascadeState(sections), out);
  return out;
}
