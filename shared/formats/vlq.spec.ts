import { describe, expect, it } from 'vitest';
import { decodeVlq, encodeVlq, writeVlq } from './vlq';

// The Standard MIDI File 1.0 spec's own table (MMA RP-001; REFERENCES.md "The spec's VLQ table").
const SPEC_TABLE: [number, number[]][] = [
  [0x00, [0x00]],
  [0x40, [0x40]],
  [0x7f, [0x7f]],
  [0x80, [0x81, 0x00]],
  [0x2000, [0xc0, 0x00]],
  [0x3fff, [0xff, 0x7f]],
  [0x4000, [0x81, 0x80, 0x00]],
  [0x100000, [0xc0, 0x80, 0x00]],
  [0x1fffff, [0xff, 0xff, 0x7f]],
  [0x200000, [0x81, 0x80, 0x80, 0x00]],
  [0x8000000, [0xc0, 0x80, 0x80, 0x00]],
  [0xfffffff, [0xff, 0xff, 0xff, 0x7f]],
];

describe('VLQ', () => {
  it.each(SPEC_TABLE)('encodes 0x%s as in the SMF spec table', (value, bytes) => {
    expect(encodeVlq(value)).toEqual(bytes);
    expect(decodeVlq(bytes)).toEqual({ value, length: bytes.length });
    const out = new Uint8Array(6);
    expect(writeVlq(out, 1, value)).toBe(1 + bytes.length);
    expect(Array.from(out.subarray(1, 1 + bytes.length))).toEqual(bytes);
  });

  it('refuses values outside 0 … 0x0FFFFFFF (the spec allows 4 bytes)', () => {
    expect(() => encodeVlq(-1)).toThrow(RangeError);
    expect(() => encodeVlq(0x10000000)).toThrow(RangeError);
    expect(() => encodeVlq(1.5)).toThrow(RangeError);
  });
});
