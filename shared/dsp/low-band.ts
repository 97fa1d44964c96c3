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
  /** 4 when the factor divides by 4, else 2 when even, else 1: groups of this many samples are averaged before the anti-alias filter. */
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
  /** Full-rate samples waiting for the rest of their group (the first `carried`). */
  carry: Float32Array;
  carried: number;
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
  const preFactor = factor % 4 === 0 ? 4 : factor % 2 === 0 ? 2 : 1;
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
    carry: new Float32Array(4),
    carried: 0,
  };
}

/**
 * Filters and decimates one block of the full-rate mono signal (linear) into
 * the builder. Same samples as pushLowBandInStages, faster when the block
 * holds whole groups and nothing is carried (what the decoders give).
 */
export function pushLowBand(builder: LowBandBuilder, block: Float32Array): void {
  const pre = builder.preFactor;
  if (takesGroupMeans(builder) && block.length % pre === 0) pushGroupMeans(builder, pre === 1 ? block : groupMeans(builder, block));
  else pushLowBandInStages(builder, block);
}

/** Whether the builder can take group means now: two anti-alias sections (the one-pass filter) and no samples carried. */
function takesGroupMeans(builder: LowBandBuilder): boolean {
  return builder.antiAlias.length === 2 && builder.carried === 0;
}

/**
 * Pushes group means already computed (P full-rate samples each, the first
 * starting a group), as a decoder that averages while it decodes gives them
 * (shared/formats/wav-read.ts decodeStereo24QuadMeansInto). False, and
 * nothing pushed, when the builder cannot take them (samples carried, or
 * not two anti-alias sections): push full-rate samples instead.
 */
export function pushGroupMeans(builder: LowBandBuilder, means: Float32Array): boolean {
  if (!takesGroupMeans(builder)) return false;
  const start = builder.written;
  antiAliasAndPick(builder, means);
  builder.consumed += means.length * builder.preFactor;
  // The band filter out here, not inlined into the loop's function, whose optimised code it kept invalidating.
  processCascadeInPlace(builder.band, builder.bandState, builder.out.subarray(start, builder.written));
  return true;
}

/**
 * Pre-decimation by the builder's group size P with a group mean (a P-tap
 * boxcar) into the scratch array: w[i] = (1/P)·Σ block[P·i + k], summed in
 * order and rounded to float32. The 4-tap boxcar (pairs averaged twice) has
 * nulls at fs/4 and fs/2, the frequencies that fold onto the band when the
 * rate drops to fs/4: what folds below 150 Hz is at least 37 dB down at
 * 48 kHz (|sin(4πf/fs) / (4·sin(πf/fs))| at fs/4 − 150 Hz; 43 dB at 96 kHz),
 * and a kick or bass stem has little at fs/4 to begin with. The cheap
 * boxcar lets the anti-alias biquads run at a quarter of the rate.
 */
function groupMeans(builder: LowBandBuilder, block: Float32Array): Float32Array {
  const pre = builder.preFactor;
  const n = block.length / pre;
  if (builder.scratch.length < n) builder.scratch = new Float32Array(n);
  const work = builder.scratch;
  if (pre === 4) for (let i = 0, j = 0; i < n; i++, j += 4) work[i] = 0.25 * (block[j]! + block[j + 1]! + block[j + 2]! + block[j + 3]!);
  else for (let i = 0, j = 0; i < n; i++, j += 2) work[i] = 0.5 * (block[j]! + block[j + 1]!);
  return work.subarray(0, n);
}

/**
 * Both anti-alias sections and the pick of every D-th pre-decimated sample
 * in one pass over `work`, only the picks stored (the caller runs the band
 * filter on them). Section one's output is rounded to float32 (Math.fround)
 * exactly as storing it in the staged path's Float32Array does, so both give
 * the same samples bit for bit (low-band.spec.ts); the two sections'
 * recurrences interleave instead of running one after the other.
 */
function antiAliasAndPick(builder: LowBandBuilder, work: Float32Array): void {
  const d = builder.factor / builder.preFactor;
  const st = builder.antiAliasState;
  const out = builder.out;
  const cap = out.length;
  let written = builder.written;
  const s1 = builder.antiAlias[0]!;
  const s2 = builder.antiAlias[1]!;
  const p0 = s1.b0, p1 = s1.b1, p2 = s1.b2, q1 = s1.a1, q2 = s1.a2;
  const r0 = s2.b0, r1 = s2.b1, r2 = s2.b2, u1 = s2.a1, u2 = s2.a2;
  let z1 = st[0]!, z2 = st[1]!, w1 = st[2]!, w2 = st[3]!;
  const n = work.length;
  // Index (in pre-decimated samples) of the next one whose index is a multiple of D.
  let next = (d - ((builder.consumed / builder.preFactor) % d)) % d;
  for (let k = 0; k < n; k++) {
    const x = work[k]!;
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
}

/** pushLowBand stage by stage, for any block; the reference the fast path is held to. */
export function pushLowBandInStages(builder: LowBandBuilder, block: Float32Array): void {
  const pre = builder.preFactor;
  // Group means as groupMeans computes them; samples short of a whole group
  // wait in `carry` for the next block.
  const carried = builder.carried;
  const total = block.length + carried;
  const n = Math.floor(total / pre);
  if (builder.scratch.length < n) builder.scratch = new Float32Array(n);
  const work = builder.scratch.subarray(0, n);
  const at = (j: number): number => (j < carried ? builder.carry[j]! : block[j - carried]!);
  for (let i = 0; i < n; i++) {
    const j = i * pre;
    if (pre === 4) work[i] = 0.25 * (at(j) + at(j + 1) + at(j + 2) + at(j + 3));
    else if (pre === 2) work[i] = 0.5 * (at(j) + at(j + 1));
    else work[i] = at(j);
  }
  const left = total - n * pre;
  const rest = Float32Array.from({ length: left }, (_, k) => at(n * pre + k));
  builder.carry.set(rest);
  builder.carried = left;
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
  const groups = Math.floor(totalFrames / builder.preFactor);
  const d = builder.factor / builder.preFactor;
  return Math.min(Math.ceil(groups / d), Math.ceil(totalFrames / builder.factor));
}

/** The finished low band. */
export function finishLowBand(builder: LowBandBuilder): LowBand {
  return { samples: builder.out.subarray(0, builder.written), rateHz: builder.rateHz, factor: builder.factor };
}

/** The low band of a whole signal in one call (same filters as the streaming builder). */
export function lowBandOf(mono: Float32Array, sampleRateHz: number, bandHz: number): LowBand {
  const builder = createLowBandBuilder(sampleRateHz, mono.length, bandHz);
  const step = 1 << 16; // a multiple of 4, so blocks hold whole groups
  for (let i = 0; i < mono.length; i += step) pushLowBand(builder, mono.subarray(i, i + step));
  return finishLowBand(builder);
}
