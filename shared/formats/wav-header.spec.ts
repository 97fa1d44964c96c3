import { describe, expect, it } from 'vitest';
import { readWavLayoutFromBytes, WavFormatError } from './wav-header';
import { PLAIN_WAV_HEADER_BYTES, writePlainWavHeader, decodeMonoBlockInto } from './wav-read';

/** A minimal plain WAV: 44-byte header + `frames` stereo 16-bit frames. */
function wav16(frames: number): Uint8Array {
  const out = new Uint8Array(PLAIN_WAV_HEADER_BYTES + frames * 4);
  const layout = { formatTag: 1, codecTag: 1, sampleFormat: 'int' as const, channels: 2, sampleRateHz: 48000, bitsPerSample: 16, blockAlign: 4, dataOffsetBytes: 44, dataBytes: frames * 4, frames };
  writePlainWavHeader(layout, frames * 4, out);
  return out;
}

describe('WAV chunk walk (RIFF 1991 layout)', () => {
  it('round trip: the header we write for wav-decoder reads back as the same layout', () => {
    const layout = readWavLayoutFromBytes(wav16(100));
    expect(layout).toMatchObject({ codecTag: 1, channels: 2, sampleRateHz: 48000, bitsPerSample: 16, blockAlign: 4, dataOffsetBytes: 44, frames: 100 });
  });
  it('a partial last frame is not counted (data rounded down to whole frames)', () => {
    const b = wav16(11);
    new DataView(b.buffer).setUint32(40, 41, true);
    new DataView(b.buffer).setUint32(4, 36 + 41, true);
    expect(readWavLayoutFromBytes(b.subarray(0, 44 + 41)).frames).toBe(10);
  });
  it('errors carry a stable code and an HTTP status', () => {
    try {
      readWavLayoutFromBytes(new Uint8Array(0));
      expect.unreachable();
    } catch (e) {
      expect(e).toBeInstanceOf(WavFormatError);
      expect((e as WavFormatError).code).toBe('audio.empty');
      expect((e as WavFormatError).status).toBe(400);
    }
  });
  it('direct mono decode: full-scale extremes map to ±1 the way wav-decoder scales them', () => {
    const b = wav16(2);
    const v = new DataView(b.buffer);
    v.setInt16(44, 32767, true);
    v.setInt16(46, 32767, true);
    v.setInt16(48, -32768, true);
    v.setInt16(50, 0, true);
    const out = new Float32Array(2);
    decodeMonoBlockInto(readWavLayoutFromBytes(b), b.subarray(44), out, 0);
    expect(out[0]).toBe(1);
    expect(out[1]).toBe(-0.5);
  });
});
