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
  /** 2 when the factor is even: pairs are averaged before the anti-alias filter. */
  preFactor: number;
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
  /** A full-rate sample waiting for its pair (NaN when none). */
  pending: number;
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
  const preFactor = factor % 2 === 0 ? 2 : 1;
  const antiAlias = biquadLowpassCascade(ANTI_ALIAS_HZ, sampleRateHz / preFactor, ANTI_ALIAS_ORDER);
  const band = biquadLowpassCascade(bandHz, rateHz, BAND_ORDER);
  return {
    factor,
    preFactor,
    rateHz,
    antiAlias,
    antiAliasState: cascadeState(antiAlias),
    band,
    bandState: cascadeState(band),
    out: new Float32Array(Math.ceil(totalFrames / factor)),
    written: 0,
    consumed: 0,
    scratch: new Float32Array(0),
    pending: NaN,
  };
}

/** Filters and decimates one block of the full-rate mono signal (linear) into the builder. */
export function pushLowBand(builder: LowBandBuilder, block: Float32Array): void {
  if (builder.preFactor === 2 && builder.antiAlias.length === 2 && Number.isNaN(builder.pending) && block.length % 2 === 0) {
    const start = builder.written;
    pushPairsFused(builder, block);
    // The band filter out here, not inlined into the loop's function, whose optimised code it kept invalidating.
    processCascadeInPlace(builder.band, builder.bandState, builder.out.subarray(start, builder.written));
  } else pushLowBandInStages(builder, block);
}

/**
 * pushLowBand for the common case (pairs, two anti-alias sections, nothing
 * waiting, an even block) in one pass: pair mean, both biquads and the pick
 * of every D-th sample per pair, only the picks stored (the caller runs the
 * band filter on them). Each stage's result
 * is rounded to float32 (Math.fround) exactly as storing it in the staged
 * path's Float32Array does, so both give the same samples bit for bit
 * (low-band.spec.ts); the two sections' recurrences interleave instead of
 * running one after the other over the block.
 */
function pushPairsFused(builder: LowBandBuilder, block: Float32Array): void {
  const d = builder.factor / 2;
  const st = builder.antiAliasState;
  const out = builder.out;
  const cap = out.length;
  const start = builder.written;
  let written = start;
  const s1 = builder.antiAlias[0]!;
  const s2 = builder.antiAlias[1]!;
  const p0 = s1.b0, p1 = s1.b1, p2 = s1.b2, q1 = s1.a1, q2 = s1.a2;
  const r0 = s2.b0, r1 = s2.b1, r2 = s2.b2, u1 = s2.a1, u2 = s2.a2;
  let z1 = st[0]!, z2 = st[1]!, w1 = st[2]!, w2 = st[3]!;
  const pairs = block.length >> 1;
  // Index (in pairs) of the next pair whose pre-decimated index is a multiple of D.
  let next = (d - ((builder.consumed / 2) % d)) % d;
  for (let k = 0; k < pairs; k++) {
    const x = Math.fround(0.5 * (block[2 * k]! + block[2 * k + 1]!));
    const y = p0 * x + z1;
    z1 = p1 * x - q1 * y + z2;
    z2 = p2 * x - q2 * y;
    const yr = Math.fround(y);
    const v = r0 * yr + w1;
    w1 = r1 * yr - u1 * v + w2;
    w2 = r2 * yr - u2 * v;
    if (k === next) {
      if (written < cap) out[written++] = v;
      next += d;
    }
  }
  st[0] = z1;
  st[1] = z2;
  st[2] = w1;
  st[3] = w2;
  builder.written = written;
  builder.consumed += pairs * 2;
}

/** pushLowBand stage by stage, for any block; the reference the fused path is held to. */
export function pushLowBandInStages(builder: LowBandBuilder, block: Float32Array): void {
  const pre = builder.preFactor;
  // Pre-decimation by 2 with a pair mean (a 2-tap boxcar: its null at fs/2
  // puts what folds onto the band ≥ 40 dB down), so the anti-alias biquads
  // run at half rate. A sample left over from an odd-length block waits in
  // `pending` for its partner.
  const hasPending = pre === 2 && !Number.isNaN(builder.pending);
  const total = block.length + (hasPending ? 1 : 0);
  const n = Math.floor(total / pre);
  if (builder.scratch.length < n) builder.scratch = new Float32Array(n);
  const work = builder.scratch.subarray(0, n);
  if (pre === 2) {
    const at = (j: number): number => (hasPending ? (j === 0 ? builder.pending : block[j - 1]!) : block[j]!);
    let i = 0;
    if (hasPending && n > 0) work[i++] = 0.5 * (builder.pending + block[0]!);
    const o = hasPending ? 1 : 0;
    for (; i < n; i++) work[i] = 0.5 * (block[2 * i - o]! + block[2 * i + 1 - o]!);
    builder.pending = total % 2 === 1 ? at(total - 1) : NaN;
  } else work.set(block);
  processCascadeInPlace(builder.antiAlias, builder.antiAliasState, work);
  const d = builder.factor / pre;
  const consumed = builder.consumed / pre;
  // Keep the samples whose (pre-decimated) index is a multiple of D.
  let i = (d - (consumed % d)) % d;
  const start = builder.written;
  for (; i < work.length && builder.written < builder.out.length; i += d) builder.out[builder.written++] = work[i]!;
  builder.consumed += n * pre;
  processCascadeInPlace(builder.band, builder.bandState, builder.out.subarray(start, builder.written));
}

/** How many low-band samples a builder gives for `totalFrames` full-rate samples (what finishLowBand will hold). */
export function lowBandLength(builder: Pick<LowBandBuilder, 'factor' | 'preFactor'>, totalFrames: number): number {
  const pairs = Math.floor(totalFrames / builder.preFactor);
  const d = builder.factor / builder.preFactor;
  return Math.min(Math.ceil(pairs / d), Math.ceil(totalFrames / builder.factor));
}

/** The finished low band. */
export function finishLowBand(builder: LowBandBuilder): LowBand {
  return { samples: builder.out.subarray(0, builder.written), rateHz: builder.rateHz, factor: builder.factor };
}

/** The low band of a whole signal in one call (same filters as the streaming builder). */
export function lowBandOf(mono: Float32Array, sampleRateHz: number, bandHz: number): LowBand {
  const builder = createLowBandBuilder(sampleRateHz, mono.length, bandHz);
  const step = 1 << 16; // even, so blocks hold whole pairs
  for (let i = 0; i < mono.length; i += step) pushLowBand(builder, mono.subarray(i, i + step));
  return finishLowBand(builder);
}
