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

import { createLowBandBuilder, finishLowBand, lowBandOf, pushLowBand } from './low-band';

describe('low band built block by block', () => {
  it('equals the one-call low band whatever the block sizes, odd ones included (property)', () => {
    const fs = 48000;
    const x = Float32Array.from({ length: 100_003 }, (_, i) => Math.sin((2 * Math.PI * 50 * i) / fs) + 0.3 * Math.sin(i));
    const whole = lowBandOf(x, fs, 120);
    const builder = createLowBandBuilder(fs, x.length, 120);
    let at = 0;
    for (const size of [1, 7, 4096, 33333, 2, 99999]) {
      pushLowBand(builder, x.subarray(at, Math.min(x.length, at + size)));
      at = Math.min(x.length, at + size);
    }
    const blocks = finishLowBand(builder);
    expect(blocks.samples.length).toBe(whole.samples.length);
    let maxDiff = 0;
    for (let i = 0; i < whole.samples.length; i++) maxDiff = Math.max(maxDiff, Math.abs(blocks.samples[i]! - whole.samples[i]!));
    expect(maxDiff).toBeLessThan(1e-6);
  });
});
