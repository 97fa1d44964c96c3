import { biquadLowpassCascade, cascadeState, processCascadeInPlace, type Biquad } from './biquad';

/**
 * The kick's low band at a low sample rate (~2 kHz): anti-alias low-pass,
 * decimation by an integer factor, then a steep low-pass at the band edge.
 * Decimating first keeps the steep filter cheap (it runs on 1/20 of the
 * samples) and gives the onset function short arrays to work on.
 */

/** Target rate after decimation: 2 kHz puts the band edge (≤ 400 Hz) well below Nyquist. */
const TARGET_RATE_HZ = 2000;
/** Anti-alias filter: 4th-order Butterworth at 300 Hz (≥ 60 dB down where 1.7–2.3 kHz folds onto the band). */
const ANTI_ALIAS_HZ = 300;
const ANTI_ALIAS_ORDER = 4;
/** Band filter: 8th-order Butterworth (48 dB/octave) — snare bodies at ~190 Hz fall ≥ 30 dB below a 120 Hz edge. */
const BAND_ORDER = 8;

export interface LowBand {
  /** Low-band samples at `rateHz`, linear full scale. */
  samples: Float32Array;
  rateHz: number;
  /** Full-rate samples per low-band sample. */
  factor: number;
}

/** Streaming state of a low-band builder; feed blocks in order with pushLowBand. */
export interface LowBandBuilder {
  factor: number;
  rateHz: number;
  antiAlias: Biquad[];
  antiAliasState: Float64Array;
  band: Biquad[];
  bandState: Float64Array;
  out: Float32Array;
  written: number;
  /** Full-rate samples seen so far. */
  consumed: number;
  scratch: Float32Array;
}

/**
 * Decimation factor D = max(1, floor(fs / 2000)); output rate fs / D.
 * @param sampleRateHz full sample rate, Hz
 * @param totalFrames number of full-rate samples that will be pushed
 * @param bandHz −3 dB edge of the band, Hz (8th-order Butterworth)
 */
export function createLowBandBuilder(sampleRateHz: number, totalFrames: number, bandHz: number): LowBandBuilder {
  const factor = Math.max(1, Math.floor(sampleRateHz / TARGET_RATE_HZ));
  const rateHz = sampleRateHz / factor;
  const antiAlias = biquadLowpassCascade(ANTI_ALIAS_HZ, sampleRateHz, ANTI_ALIAS_ORDER);
  const band = biquadLowpassCascade(bandHz, rateHz, BAND_ORDER);
  return {
    factor,
    rateHz,
    antiAlias,
    antiAliasState: cascadeState(antiAlias),
    band,
    bandState: cascadeState(band),
    out: new Float32Array(Math.ceil(totalFrames / factor)),
    written: 0,
    consumed: 0,
    scratch: new Float32Array(0),
  };
}

/** Filters and decimates one block of the full-rate mono signal (linear) into the builder. */
export function pushLowBand(builder: LowBandBuilder, block: Float32Array): void {
  if (builder.scratch.length < block.length) builder.scratch = new Float32Array(block.length);
  const work = builder.scratch.subarray(0, block.length);
  work.set(block);
  processCascadeInPlace(builder.antiAlias, builder.antiAliasState, work);
  const d = builder.factor;
  // Keep the samples whose full-rate index is a multiple of D.
  let i = (d - (builder.consumed % d)) % d;
  const start = builder.written;
  for (; i < work.length && builder.written < builder.out.length; i += d) builder.out[builder.written++] = work[i]!;
  builder.consumed += block.length;
  processCascadeInPlace(builder.band, builder.bandState, builder.out.subarray(start, builder.written));
}

/** The finished low band. */
export function finishLowBand(builder: LowBandBuilder): LowBand {
  return { samples: builder.out.subarray(0, builder.written), rateHz: builder.rateHz, factor: builder.factor };
}

/** The low band of a whole signal in one call (same filters as the streaming builder). */
export function lowBandOf(mono: Float32Array, sampleRateHz: number, bandHz: number): LowBand {
  const builder = createLowBandBuilder(sampleRateHz, mono.length, bandHz);
  const step = 1 << 16;
  for (let i = 0; i < mono.length; i += step) pushLowBand(builder, mono.subarray(i, i + step));
  return finishLowBand(builder);
}
