import { measureLoudness } from './loudness';
import { peakLevelsDb } from './true-peak';

/** The four figures of one signal in the headroom report (GLOSSARY "Headroom report"). */
export interface LevelFigures {
  samplePeakDbfs: number;
  truePeakDbtp: number;
  integratedLufs: number;
  maxShortTermLufs: number;
}

/** Sample peak, true peak (BS.1770-4 Annex 2), integrated and maximum short-term loudness (BS.1770-4, EBU Tech 3341). */
export function levelFigures(channels: readonly Float32Array[], sampleRateHz: number): LevelFigures {
  const loudness = measureLoudness(channels, sampleRateHz);
  const peaks = peakLevelsDb(channels);
  return {
    samplePeakDbfs: peaks.samplePeakDbfs,
    truePeakDbtp: peaks.truePeakDbtp,
    integratedLufs: loudness.integratedLufs,
    maxShortTermLufs: loudness.maxShortTermLufs,
  };
}

/**
 * Sums stems into one bus: equal channel counts add channel by channel, a mono
 * stem is added to every channel of a wider one, anything else is mixed to mono
 * first. Lengths may differ; the sum is as long as the longest.
 */
export function sumStems(stems: readonly (readonly Float32Array[])[]): Float32Array[] {
  const out = Array.from({ length: busWidth(stems) }, () => new Float32Array(busFrames(stems)));
  return sumStemsInto(stems, out);
}

/** Channels of the bus `sumStems` makes: the common width when all wide stems agree, else mono. */
export function busWidth(stems: readonly (readonly Float32Array[])[]): number {
  const widths = new Set(stems.map((s) => s.length).filter((w) => w > 1));
  return widths.size === 1 ? [...widths][0] : 1;
}

/** Frames of the bus `sumStems` makes: the longest stem's. */
export function busFrames(stems: readonly (readonly Float32Array[])[]): number {
  return Math.max(0, ...stems.map((s) => s[0]?.length ?? 0));
}

/** `sumStems` into `out` (busWidth channels of busFrames frames, overwritten), so a second sum can reuse the first one's buffers. */
export function sumStemsInto(stems: readonly (readonly Float32Array[])[], out: Float32Array[]): Float32Array[] {
  out.forEach((o, c) => {
    const terms: { x: Float32Array; scale: number }[] = [];
    for (const stem of stems) {
      if (stem.length === out.length) terms.push({ x: stem[c], scale: 1 });
      else if (stem.length === 1) terms.push({ x: stem[0], scale: 1 });
      else if (c === 0) for (const ch of stem) terms.push({ x: ch, scale: 1 / stem.length });
    }
    let from = 0;
    const [a, b] = terms;
    if (b && a.scale === 1 && b.scale === 1 && a.x.length === o.length && b.x.length === o.length) {
      // The usual kick + bass: one pass writing a + b rather than a zero fill and two read-modify-writes.
      addTwo(a.x, b.x, o);
      from = 2;
    } else {
      o.fill(0);
    }
    for (let t = from; t < terms.length; t++) addInto(o, terms[t].x, terms[t].scale);
  });
  return out;
}

/** out[i] = a[i] + b[i], rounded to 32 bits as `addInto` would after 0 + a. */
function addTwo(a: Float32Array, b: Float32Array, out: Float32Array): void {
  for (let i = 0; i < out.length; i++) out[i] = a[i] + b[i];
}

/** out[i] += x[i]·scale over x's length (one plain loop, so it stays a tight loop in V8). */
function addInto(out: Float32Array, x: Float32Array, scale: number): void {
  const n = x.length;
  if (scale === 1) for (let i = 0; i < n; i++) out[i] += x[i];
  else for (let i = 0; i < n; i++) out[i] += x[i] * scale;
}

/**
 * Multiplies every channel by a per-frame linear gain (same length or shorter:
 * missing gains count as 1), into `out` (one buffer per channel, as long as
 * it) or new arrays. Channels go in order, each sample read before it is
 * written, so `gains` itself may be the last channel's buffer.
 */
export function applyGains(channels: readonly Float32Array[], gains: Float32Array, out: Float32Array[] = channels.map((ch) => new Float32Array(ch.length))): Float32Array[] {
  return channels.map((ch, c) => {
    const o = out[c];
    const m = Math.min(ch.length, gains.length);
    for (let i = 0; i < m; i++) o[i] = ch[i] * gains[i];
    if (m < ch.length) o.set(ch.subarray(m), m);
    return o;
  });
}

/** The peak of a bus inside [t0, t1] s, dBFS (sample peak). */
export function windowPeakDbfs(channels: readonly Float32Array[], sampleRateHz: number, t0Sec: number, t1Sec: number): number {
  const a = Math.max(0, Math.floor(t0Sec * sampleRateHz));
  const b = Math.min(channels[0]?.length ?? 0, Math.ceil(t1Sec * sampleRateHz));
  let peak = 0;
  for (const ch of channels) for (let i = a; i < b; i++) if (Math.abs(ch[i]) > peak) peak = Math.abs(ch[i]);
  return 20 * Math.log10(peak);
}
