import { describe, expect, it } from 'vitest';
import { biquadLowpass, biquadLowpassCascade, butterworthQs, filterCascade, type Biquad } from './biquad';

/** |H(e^{jω})| of a cascade at f Hz, from its coefficients. */
function magnitude(sections: Biquad[], f: number, fs: number): number {
  const w = (2 * Math.PI * f) / fs;
  let mag = 1;
  for (const { b0, b1, b2, a1, a2 } of sections) {
    const re = (c0: number, c1: number, c2: number): number => c0 + c1 * Math.cos(w) + c2 * Math.cos(2 * w);
    const im = (c1: number, c2: number): number => -c1 * Math.sin(w) - c2 * Math.sin(2 * w);
    mag *= Math.hypot(re(b0, b1, b2), im(b1, b2)) / Math.hypot(re(1, a1, a2), im(a1, a2));
  }
  return mag;
}

describe('biquad low-pass (RBJ cookbook; Butterworth pole Qs)', () => {
  it('4th-order Butterworth Qs are 0.5412 and 1.3066 (standard filter tables)', () => {
    const [q1, q2] = butterworthQs(4);
    expect(q1).toBeCloseTo(0.5412, 4);
    expect(q2).toBeCloseTo(1.3066, 4);
  });
  it('unity gain at DC, −3.01 dB at the cut-off, −24·log2 dB per octave far above (Butterworth, order 4)', () => {
    for (const fs of [44100, 48000, 96000, 192000]) {
      const c = biquadLowpassCascade(150, fs, 4);
      expect(magnitude(c, 0, fs)).toBeCloseTo(1, 9);
      expect(20 * Math.log10(magnitude(c, 150, fs))).toBeCloseTo(-3.01, 1);
      // Two octaves up: 10·log10(1 + 4^8) ≈ 48.2 dB for an analogue 4th-order Butterworth.
      expect(20 * Math.log10(magnitude(c, 600, fs))).toBeCloseTo(-48.2, 0);
    }
  });
  it('filtering a DC step settles to the step (property: DC gain 1)', () => {
    const y = filterCascade([biquadLowpass(100, 48000, Math.SQRT1_2)], new Float32Array(48000).fill(0.5));
    expect(y[47999]).toBeCloseTo(0.5, 5);
  });
});
