import { describe, expect, it } from 'vitest';
import { mulberry32 } from '../dsp/prng';
import type { WavLayout } from './wav-header';
import { decodeMonoBlockInto, decodeStereo24QuadMeansInto } from './wav-read';

function layout(channels: number, bitsPerSample: number, frames: number): WavLayout {
  const blockAlign = (channels * bitsPerSample) / 8;
  return { formatTag: 1, codecTag: 1, sampleFormat: 'int', channels, sampleRateHz: 48000, bitsPerSample, blockAlign, dataOffsetBytes: 44, dataBytes: frames * blockAlign, frames };
}

/** Little-endian 24-bit samples, two's complement, as a WAV data chunk holds them. */
function pcm24(samples: number[]): Uint8Array {
  const out = new Uint8Array(samples.length * 3);
  samples.forEach((v, i) => {
    const u = v < 0 ? v + 0x1000000 : v;
    out[3 * i] = u & 0xff;
    out[3 * i + 1] = (u >> 8) & 0xff;
    out[3 * i + 2] = (u >> 16) & 0xff;
  });
  return out;
}

describe('stereo 24-bit straight to four-frame means', () => {
  it('equals the mono mixdown averaged four frames at a time', () => {
    const rnd = mulberry32(24);
    const frames = 4096;
    // Full-scale extremes included; quiet samples too, where the two paths must agree bit for bit.
    const samples = Array.from({ length: frames * 2 }, (_, i) => {
      if (i < 8) return [-0x800000, 0x7fffff, 0x7fffff, -0x800000, 0, -1, 1, 0][i]!;
      const scale = i < frames ? 0x7fffff : 0x1fffff;
      return Math.round((rnd() * 2 - 1) * scale);
    });
    const bytes = pcm24(samples);
    const l = layout(2, 24, frames);
    const mono = new Float32Array(frames);
    decodeMonoBlockInto(l, bytes, mono, 0);
    const means = new Float32Array(frames / 4);
    expect(decodeStereo24QuadMeansInto(l, bytes, means, 0)).toBe(frames / 4);
    let worst = 0;
    let quietDiffer = 0;
    for (let g = 0; g < frames / 4; g++) {
      const want = Math.fround(0.25 * (mono[4 * g]! + mono[4 * g + 1]! + mono[4 * g + 2]! + mono[4 * g + 3]!));
      worst = Math.max(worst, Math.abs(means[g]! - want));
      // Frames whose two samples sum below 2^24 round nowhere but at the end (the second half is 12 dB down).
      if (4 * g >= frames / 2 && !Object.is(means[g], want)) quietDiffer++;
      // The means themselves, from the integers (decodeStereo24Into's scale, 2^-23 per step).
      const exact = samples.slice(8 * g, 8 * g + 8).reduce((a, b) => a + b, 0) / 8 / 8388608;
      expect(Math.abs(means[g]! - exact)).toBeLessThanOrEqual(6e-8);
    }
    expect(worst).toBeLessThanOrEqual(1.2e-7); // one float32 step near full scale
    expect(quietDiffer).toBe(0);
    // By hand: (−2^23 + (2^23 − 1) + (2^23 − 1) − 2^23 + 0 − 1 + 1 + 0) / 2^26 = −2 / 2^26, a float32 exactly.
    expect(means[0]).toBe(-2 / 67108864);
  });

  it('declines what it has no fast path for', () => {
    const bytes = new Uint8Array(24 * 8);
    const out = new Float32Array(8);
    expect(decodeStereo24QuadMeansInto(layout(1, 24, 64), bytes, out, 0)).toBe(-1); // mono
    expect(decodeStereo24QuadMeansInto(layout(2, 16, 48), bytes, out, 0)).toBe(-1); // 16-bit
    expect(decodeStereo24QuadMeansInto(layout(2, 24, 6), bytes.subarray(0, 36), out, 0)).toBe(-1); // 6 frames, not whole groups
    expect(decodeStereo24QuadMeansInto(layout(2, 24, 4), bytes.subarray(2, 26), out, 0)).toBe(-1); // not 4-byte aligned
  });
});
