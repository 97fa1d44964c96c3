import { describe, expect, it } from 'vitest';
import WavDecoder from 'wav-decoder';
import { encodeWav } from './wav-write';

describe('encodeWav', () => {
  // Not −1 exactly: wav-decoder 1.3.0 reads 24-bit 0x800000 (−1.0) as +1.0000001 (its `xx > 0x800000` test);
  // the encoding of −1 is checked against the bytes below instead.
  const x = new Float32Array([0, 0.5, -0.5, 1, -0.999, 0.25, -0.123456]);
  it.each([
    [8, 'int'],
    [16, 'int'],
    [24, 'int'],
    [32, 'int'],
    [32, 'float'],
    [64, 'float'],
  ] as const)('round-trips %i-bit %s through wav-decoder (an independent reader) within one LSB', (bitDepth, sampleFormat) => {
    const bytes = encodeWav([x, x.map((v) => -v / 2)], { sampleRate: 44100, bitDepth, sampleFormat });
    const decoded = WavDecoder.decode.sync(bytes.buffer as ArrayBuffer);
    expect(decoded.sampleRate).toBe(44100);
    expect(decoded.channelData).toHaveLength(2);
    const lsb = sampleFormat === 'float' ? 1e-7 : 1 / Math.pow(2, bitDepth - 1);
    for (let i = 0; i < x.length; i++) {
      expect(Math.abs(decoded.channelData[0][i] - x[i])).toBeLessThanOrEqual(lsb);
      expect(Math.abs(decoded.channelData[1][i] + x[i] / 2)).toBeLessThanOrEqual(lsb);
    }
  });

  it('writes full-scale negative 24-bit as 00 00 80 and clips beyond full scale (two\'s complement, little-endian)', () => {
    const bytes = encodeWav([new Float32Array([-1, -2, 2])], { sampleRate: 48000, bitDepth: 24, sampleFormat: 'int' });
    expect(Array.from(bytes.subarray(44, 53))).toEqual([0x00, 0x00, 0x80, 0x00, 0x00, 0x80, 0xff, 0xff, 0x7f]);
    expect(String.fromCharCode(...bytes.subarray(0, 4), ...bytes.subarray(8, 16))).toBe('RIFFWAVEfmt ');
  });
});
