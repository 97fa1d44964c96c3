import { measureLoudness, samplePeakDbfs } from './loudness';
import { truePeakDbtp } from './true-peak';

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
  return {
    samplePeakDbfs: samplePeakDbfs(channels),
    truePeakDbtp: truePeakDbtp(channels),
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
  const widths = new Set(stems.map((s) => s.length).filter((w) => w > 1));
  const width = widths.size === 1 ? [...widths][0] : widths.size === 0 ? 1 : 1;
  const frames = Math.max(0, ...stems.map((s) => s[0]?.length ?? 0));
  const out = Array.from({ length: width }, () => new Float32Array(frames));
  for (const stem of stems) {
    if (stem.length === width) {
      stem.forEach((ch, c) => {
        const o = out[c];
        for (let i = 0; i < ch.length; i++) o[i] += ch[i];
      });
    } else if (stem.length === 1) {
      const ch = stem[0];
      for (const o of out) for (let i = 0; i < ch.length; i++) o[i] += ch[i];
    } else {
      const scale = 1 / stem.length;
      for (const ch of stem) for (let i = 0; i < ch.length; i++) out[0][i] += ch[i] * scale;
    }
  }
  return out;
}

/** Multiplies every channel by a per-frame linear gain (same length or shorter: missing gains count as 1). */
export function applyGains(channels: readonly Float32Array[], gains: Float32Array): Float32Array[] {
  return channels.map((ch) => {
    const out = new Float32Array(ch.length);
    for (let i = 0; i < ch.length; i++) out[i] = ch[i] * (i < gains.length ? gains[i] : 1);
    return out;
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
