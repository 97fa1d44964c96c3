import type { Biquad } from './biquad';
import { kWeightingFilters } from './k-weighting';

export interface LoudnessResult {
  /** Integrated loudness, LUFS (−Infinity when every block is gated out). */
  integratedLufs: number;
  /** Highest short-term (3 s) loudness, LUFS, evaluated every 100 ms. */
  maxShortTermLufs: number;
  /** Highest momentary (400 ms) loudness, LUFS. */
  maxMomentaryLufs: number;
}

/** Channel weights G_i of BS.1770-4 Table 3: 1.0 for L, R, C; 1.41 for Ls, Rs (5.1 order L R C LFE Ls Rs; LFE excluded). */
function channelWeights(channels: number): number[] {
  if (channels === 6) return [1, 1, 1, 0, 1.41, 1.41];
  return new Array(channels).fill(1);
}

const toLufs = (meanSquare: number) => -0.691 + 10 * Math.log10(meanSquare);

/**
 * power[s] += w · Σ z² over step s (`step` samples), z = the channel through
 * the shelf then the high-pass (K-weighting, BS.1770-4 §2.1), both biquads
 * inline in transposed direct form II: this loop is the cost of the report.
 */
function addKWeightedPower(x: Float32Array, w: number, shelf: Biquad, hp: Biquad, step: number, power: Float64Array): void {
  const { b0: sb0, b1: sb1, b2: sb2, a1: sa1, a2: sa2 } = shelf;
  const { b0: hb0, b1: hb1, b2: hb2, a1: ha1, a2: ha2 } = hp;
  let s1 = 0, s2 = 0, h1 = 0, h2 = 0;
  for (let st = 0; st < power.length; st++) {
    let sum = 0;
    const end = (st + 1) * step;
    for (let i = st * step; i < end; i++) {
      const v = x[i];
      const y = sb0 * v + s1;
      s1 = sb1 * v - sa1 * y + s2;
      s2 = sb2 * v - sa2 * y;
      const z = hb0 * y + h1;
      h1 = hb1 * y - ha1 * z + h2;
      h2 = hb2 * y - ha2 * z;
      sum += z * z;
    }
    power[st] += w * sum;
  }
}

/** `addKWeightedPower` for two channels in one loop (the same arithmetic per channel). */
function addKWeightedPowerPair(x: Float32Array, wx: number, u: Float32Array, wu: number, shelf: Biquad, hp: Biquad, step: number, power: Float64Array): void {
  const { b0: sb0, b1: sb1, b2: sb2, a1: sa1, a2: sa2 } = shelf;
  const { b0: hb0, b1: hb1, b2: hb2, a1: ha1, a2: ha2 } = hp;
  let s1 = 0, s2 = 0, h1 = 0, h2 = 0;
  let t1 = 0, t2 = 0, g1 = 0, g2 = 0;
  for (let st = 0; st < power.length; st++) {
    let sum = 0;
    let sumU = 0;
    const end = (st + 1) * step;
    for (let i = st * step; i < end; i++) {
      const v = x[i];
      const y = sb0 * v + s1;
      s1 = sb1 * v - sa1 * y + s2;
      s2 = sb2 * v - sa2 * y;
      const z = hb0 * y + h1;
      h1 = hb1 * y - ha1 * z + h2;
      h2 = hb2 * y - ha2 * z;
      sum += z * z;
      const q = u[i];
      const yu = sb0 * q + t1;
      t1 = sb1 * q - sa1 * yu + t2;
      t2 = sb2 * q - sa2 * yu;
      const zu = hb0 * yu + g1;
      g1 = hb1 * yu - ha1 * zu + g2;
      g2 = hb2 * yu - ha2 * zu;
      sumU += zu * zu;
    }
    power[st] += wx * sum + wu * sumU;
  }
}

/**
 * Loudness per ITU-R BS.1770-4 and EBU Tech 3341/3342:
 * K-weight each channel, mean square z_i over 400 ms blocks with 75 % overlap,
 * L = −0.691 + 10·log10 Σ G_i·z_i; integrated = gated mean over blocks above
 * −70 LUFS (absolute gate) and above the absolute-gated loudness − 10 LU
 * (relative gate). Short-term: 3 s windows every 100 ms (EBU Tech 3341 §2.2).
 *
 * @param channels one Float32Array per channel, −1..1
 * @param sampleRateHz sample rate
 */
export function measureLoudness(channels: readonly Float32Array[], sampleRateHz: number): LoudnessResult {
  const frames = channels[0]?.length ?? 0;
  const weights = channelWeights(channels.length);
  const step = Math.round(0.1 * sampleRateHz); // 100 ms: the 75 % overlap hop of 400 ms blocks
  const steps = Math.floor(frames / step);
  // Weighted power per 100 ms step, summed over channels.
  const power = new Float64Array(steps);
  const [shelf, hp] = kWeightingFilters(sampleRateHz);
  const measured = channels.map((channel, c) => ({ channel, w: weights[c] })).filter((m) => m.w);
  // Two channels at a time: each K-weighting chain waits on its own previous output,
  // so two independent chains in one loop run in about the time of one.
  for (let c = 0; c + 1 < measured.length; c += 2) addKWeightedPowerPair(measured[c].channel, measured[c].w, measured[c + 1].channel, measured[c + 1].w, shelf, hp, step, power);
  if (measured.length % 2) addKWeightedPower(measured[measured.length - 1].channel, measured[measured.length - 1].w, shelf, hp, step, power);

  const windowPower = (stepsPerWindow: number) => {
    const out: number[] = [];
    let acc = 0;
    for (let s = 0; s < steps; s++) {
      acc += power[s];
      if (s >= stepsPerWindow) acc -= power[s - stepsPerWindow];
      if (s >= stepsPerWindow - 1) out.push(Math.max(0, acc) / (stepsPerWindow * step));
    }
    return out;
  };
  const blocks = windowPower(4);
  const shortTerm = windowPower(30);

  const absGated = blocks.filter((z) => toLufs(z) > -70);
  let integratedLufs = -Infinity;
  if (absGated.length) {
    const relativeGate = toLufs(absGated.reduce((a, b) => a + b, 0) / absGated.length) - 10;
    const gated = absGated.filter((z) => toLufs(z) > relativeGate);
    if (gated.length) integratedLufs = toLufs(gated.reduce((a, b) => a + b, 0) / gated.length);
  }
  const maxOf = (values: number[]) => (values.length ? toLufs(Math.max(...values)) : -Infinity);
  return { integratedLufs, maxShortTermLufs: maxOf(shortTerm), maxMomentaryLufs: maxOf(blocks) };
}

/** Sample peak, dBFS: 20·log10 max |x| over all channels (−Infinity for silence). */
export function samplePeakDbfs(channels: readonly Float32Array[]): number {
  let peak = 0;
  for (const ch of channels) {
    for (let i = 0; i < ch.length; i++) {
      const a = ch[i] < 0 ? -ch[i] : ch[i];
      if (a > peak) peak = a;
    }
  }
  return 20 * Math.log10(peak);
}
