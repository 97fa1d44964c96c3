/**
 * Standard MIDI File variable-length quantity (MMA RP-001, "Variable Length
 * Quantities"): 7 bits per byte, most significant group first, bit 7 set on
 * every byte but the last; values 0 … 0x0FFFFFFF (at most 4 bytes).
 */
export function encodeVlq(value: number): number[] {
  if (!Number.isInteger(value) || value < 0 || value > 0x0fffffff) throw new RangeError(`VLQ out of range: ${value}`);
  const bytes = [value & 0x7f];
  let v = value >>> 7;
  while (v > 0) {
    bytes.unshift((v & 0x7f) | 0x80);
    v >>>= 7;
  }
  return bytes;
}

/** Reads a VLQ at `offset`; returns the value and the number of bytes read. */
export function decodeVlq(bytes: ArrayLike<number>, offset = 0): { value: number; length: number } {
  let value = 0;
  for (let i = 0; i < 4; i++) {
    const b = bytes[offset + i];
    if (b === undefined) throw new RangeError('VLQ runs past the end');
    value = (value << 7) | (b & 0x7f);
    if ((b & 0x80) === 0) return { value, length: i + 1 };
  }
  throw new RangeError('VLQ longer than 4 bytes');
}

/** Writes the VLQ of `value` into `out` at `at` (no allocation); returns the index after it. */
export function writeVlq(out: Uint8Array, at: number, value: number): number {
  if (value < 0x80) {
    out[at] = value;
    return at + 1;
  }
  let n = 1;
  for (let v = value >>> 7; v > 0; v >>>= 7) n++;
  if (n > 4 || !Number.isInteger(value)) throw new RangeError(`VLQ out of range: ${value}`);
  for (let i = n - 1, v = value; i >= 0; i--, v >>>= 7) out[at + i] = (v & 0x7f) | (i === n - 1 ? 0 : 0x80);
  return at + n;
}
