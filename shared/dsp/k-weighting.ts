import type { Biquad } from './biquad';

/**
 * The two K-weighting stages of ITU-R BS.1770-4 (§2.1): a high-shelf "head"
 * filter (+4 dB above ~1.7 kHz) and the RLB high-pass (~38 Hz).
 *
 * The standard lists the coefficients for 48 kHz only. For other rates the
 * analogue prototypes are re-derived with the bilinear transform, using the
 * prototype parameters that reproduce the 48 kHz table (f0 = 1681.974 Hz,
 * G = 3.99984 dB, Q = 0.70718 for the shelf; f0 = 38.135 Hz, Q = 0.50033 for
 * the high-pass — the parameters libebur128 uses, from memory). At 48 kHz
 * this gives the standard's coefficients to 1e-8 (tested).
 */
export function kWeightingFilters(sampleRateHz: number): [Biquad, Biquad] {
  const shelfF0 = 1681.974450955533;
  const shelfG = 3.999843853973347;
  const shelfQ = 0.7071752369554196;
  let k = Math.tan((Math.PI * shelfF0) / sampleRateHz);
  const vh = Math.pow(10, shelfG / 20);
  const vb = Math.pow(vh, 0.4996667741545416);
  let a0 = 1 + k / shelfQ + k * k;
  const shelf: Biquad = {
    b0: (vh + (vb * k) / shelfQ + k * k) / a0,
    b1: (2 * (k * k - vh)) / a0,
    b2: (vh - (vb * k) / shelfQ + k * k) / a0,
    a1: (2 * (k * k - 1)) / a0,
    a2: (1 - k / shelfQ + k * k) / a0,
  };
  const hpF0 = 38.13547087602444;
  const hpQ = 0.5003270373238773;
  k = Math.tan((Math.PI * hpF0) / sampleRateHz);
  a0 = 1 + k / hpQ + k * k;
  const highpass: Biquad = { b0: 1, b1: -2, b2: 1, a1: (2 * (k * k - 1)) / a0, a2: (1 - k / hpQ + k * k) / a0 };
  return [shelf, highpass];
}
