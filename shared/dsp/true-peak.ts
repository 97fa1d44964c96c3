/**
 * True peak per ITU-R BS.1770-4 Annex 2: oversample by 4, take the largest
 * absolute value, in dBTP. The annex's own 48-tap filter is one choice; this
 * one is our design — 4 phases of 24 taps, a windowed sinc
 * (Kaiser, β = 8) cut at the original Nyquist frequency, each phase normalised
 * to unity gain at DC. The annex allows any interpolator that meets its
 * accuracy; the EBU Tech 3341 true-peak cases check ours, and so does
 * ffmpeg's ebur128 meter on music-like and full-band noise signals (tested).
 * 24 taps a phase rather than the annex's 12: on full-band noise a shorter
 * interpolator under-reads by about 1 dB (measured here against ffmpeg).
 */
const PHASES = 4;
const TAPS = 24;

function besselI0(x: number): number {
  let sum = 1;
  let term = 1;
  for (let k = 1; k < 30; k++) {
    term *= (x / (2 * k)) ** 2;
    sum += term;
  }
  return sum;
}

function designPhases(): Float64Array[] {
  const length = PHASES * TAPS;
  const beta = 8;
  // Centred on a tap (not between two), so phase p interpolates at exactly i + p/4.
  const center = length / 2;
  const h = new Float64Array(length);
  for (let n = 0; n < length; n++) {
    const t = (n - center) / PHASES;
    const sinc = t === 0 ? 1 : Math.sin(Math.PI * t) / (Math.PI * t);
    const r = (n - center) / (length / 2);
    const window = besselI0(beta * Math.sqrt(Math.max(0, 1 - r * r))) / besselI0(beta);
    h[n] = sinc * window;
  }
  const phases: Float64Array[] = [];
  for (let p = 0; p < PHASES; p++) {
    const taps = new Float64Array(TAPS);
    let sum = 0;
    for (let k = 0; k < TAPS; k++) {
      taps[k] = h[k * PHASES + p];
      sum += taps[k];
    }
    for (let k = 0; k < TAPS; k++) taps[k] /= sum;
    phases.push(taps);
  }
  return phases;
}

const phases = designPhases();
/** Largest Σ|taps| of a phase: no interpolated value exceeds this times the largest |x| under the taps. */
/** Phases 1–3 (phase 0 is the sample itself) in one array: TAPS coefficients each. */
const flatTaps = Float64Array.from(phases.slice(1).flatMap((taps) => Array.from(taps)));
const tapGain = Math.max(...phases.map((taps) => taps.reduce((a, b) => a + Math.abs(b), 0)));

/** Samples per block of the search below. */
const BLOCK = 64;

/**
 * Largest |x| of the 4× oversampled signal of one channel (linear, full scale = 1).
 *
 * Two economies keep a 5-minute stem cheap:
 * - Interpolated values are bounded by Σ|taps|·max|x| under the taps, so blocks
 *   are visited loudest first and the search stops at the first block whose
 *   bound cannot beat the peak found so far.
 * - Inside a block, only the intervals within two samples of a local maximum
 *   of |x| are interpolated: the reconstructed waveform's peaks sit beside the
 *   sampled peaks that bracket them. Plateaus (the EBU Tech 3341 fs/4 cases,
 *   where every sample ties) count as maxima. Checked against the EBU cases and
 *   against ffmpeg's meter on tones, full-band noise and kick-plus-sub mixes.
 */
export function truePeakLinear(samples: Float32Array): number {
  const n = samples.length;
  const blocks = Math.ceil(n / BLOCK);
  const blockMax = new Float32Array(blocks);
  let peak = 0;
  for (let b = 0; b < blocks; b++) {
    let m = 0;
    const end = Math.min(n, (b + 1) * BLOCK);
    for (let i = b * BLOCK; i < end; i++) {
      const a = samples[i] < 0 ? -samples[i] : samples[i];
      if (a > m) m = a;
    }
    blockMax[b] = m;
    if (m > peak) peak = m;
  }
  // A block's interpolated values also depend on up to TAPS/2 samples of each neighbour.
  const reach = new Float32Array(blocks);
  for (let b = 0; b < blocks; b++) reach[b] = Math.max(blockMax[b], b > 0 ? blockMax[b - 1] : 0, b + 1 < blocks ? blockMax[b + 1] : 0);
  const order = Array.from({ length: blocks }, (_, b) => b).sort((a, b) => reach[b] - reach[a]);
  const half = TAPS / 2;
  // Local maxima of |x| (ties included), one pass.
  const isMax = new Uint8Array(n + 3);
  let prev = 0;
  let cur = n ? Math.abs(samples[0]) : 0;
  for (let m = 0; m < n; m++) {
    const next = m + 1 < n ? Math.abs(samples[m + 1]) : 0;
    if (cur >= prev && cur >= next) isMax[m] = 1;
    prev = cur;
    cur = next;
  }
  for (const b of order) {
    if (reach[b] * tapGain <= peak) break;
    const first = b * BLOCK;
    const end = Math.min(n, first + BLOCK);
    for (let i = first; i < end; i++) {
      // Interval (i, i+1) is interpolated when a local maximum of |x| lies in i−1 … i+2.
      if (!(isMax[i] | isMax[i + 1] | isMax[i + 2] | (i > 0 ? isMax[i - 1] : 0))) continue;
      const top = i + half;
      if (top - (TAPS - 1) >= 0 && top < n) {
        // Interior: all taps inside the signal, no bounds checks (the hot loop).
        for (let p = 0; p < PHASES - 1; p++) {
          const o = p * TAPS;
          let acc = 0;
          for (let k = 0; k < TAPS; k++) acc += flatTaps[o + k] * samples[top - k];
          const a = acc < 0 ? -acc : acc;
          if (a > peak) peak = a;
        }
      } else {
        for (let p = 0; p < PHASES - 1; p++) {
          const o = p * TAPS;
          let acc = 0;
          for (let k = 0; k < TAPS; k++) {
            const j = top - k;
            if (j >= 0 && j < n) acc += flatTaps[o + k] * samples[j];
          }
          const a = acc < 0 ? -acc : acc;
          if (a > peak) peak = a;
        }
      }
    }
  }
  return peak;
}

/** True peak over all channels, dBTP = 20·log10(max over channels of the 4× oversampled |x|). */
export function truePeakDbtp(channels: readonly Float32Array[]): number {
  let peak = 0;
  for (const ch of channels) peak = Math.max(peak, truePeakLinear(ch));
  return 20 * Math.log10(peak);
}
