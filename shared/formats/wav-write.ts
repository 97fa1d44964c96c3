/**
 * WAV writing (RIFF/WAVE per Microsoft/IBM "Multimedia Programming Interface
 * and Data Specifications 1.0", 1991): plain format tags, 1 = integer PCM,
 * 3 = IEEE float (with an 18-byte fmt chunk and a `fact` chunk, as non-PCM
 * formats carry). Pure: bytes in Uint8Arrays, the caller writes them.
 */

export interface WavWriteFormat {
  sampleRate: number;
  channels: number;
  /** 8, 16, 24 or 32 for 'int'; 32 or 64 for 'float'. */
  bitDepth: number;
  sampleFormat: 'int' | 'float';
}

/** Header bytes of a plain WAV with `frames` frames; the samples follow it directly. */
export function wavHeader(fmt: WavWriteFormat, frames: number): Uint8Array {
  const isFloat = fmt.sampleFormat === 'float';
  if (isFloat ? fmt.bitDepth !== 32 && fmt.bitDepth !== 64 : ![8, 16, 24, 32].includes(fmt.bitDepth)) {
    throw new RangeError(`Cannot write ${fmt.bitDepth}-bit ${fmt.sampleFormat} WAV`);
  }
  const blockAlign = (fmt.channels * fmt.bitDepth) / 8;
  const dataBytes = frames * blockAlign;
  const fmtBytes = isFloat ? 18 : 16;
  const factBytes = isFloat ? 12 : 0;
  const headerBytes = 12 + 8 + fmtBytes + factBytes + 8;
  const out = new Uint8Array(headerBytes);
  const v = new DataView(out.buffer);
  const tag = (at: number, s: string) => {
    for (let i = 0; i < 4; i++) out[at + i] = s.charCodeAt(i);
  };
  tag(0, 'RIFF');
  v.setUint32(4, headerBytes - 8 + dataBytes + (dataBytes & 1), true);
  tag(8, 'WAVE');
  tag(12, 'fmt ');
  v.setUint32(16, fmtBytes, true);
  v.setUint16(20, isFloat ? 3 : 1, true);
  v.setUint16(22, fmt.channels, true);
  v.setUint32(24, fmt.sampleRate, true);
  v.setUint32(28, fmt.sampleRate * blockAlign, true);
  v.setUint16(32, blockAlign, true);
  v.setUint16(34, fmt.bitDepth, true);
  let at = 36;
  if (isFloat) {
    v.setUint16(at, 0, true);
    at += 2;
    tag(at, 'fact');
    v.setUint32(at + 4, 4, true);
    v.setUint32(at + 8, frames, true);
    at += 12;
  }
  tag(at, 'data');
  v.setUint32(at + 4, dataBytes, true);
  return out;
}

/**
 * Interleaves and encodes samples (full scale ±1) into `out` (or a new array).
 * Integer coding inverts wav-decoder's reading (negative values ×2^(b−1),
 * positive ×(2^(b−1) − 1), 8-bit offset by 128), so a file read and written
 * back at unity gain is bit-identical. Values beyond full scale are clipped.
 */
export function encodeWavSamples(channels: readonly Float32Array[], fmt: WavWriteFormat, frames = channels[0]?.length ?? 0, out?: Uint8Array): Uint8Array {
  const bytesPer = fmt.bitDepth / 8;
  const size = frames * channels.length * bytesPer;
  const bytes = out ?? new Uint8Array(size);
  const v = new DataView(bytes.buffer, bytes.byteOffset, size);
  const nch = channels.length;
  let at = 0;
  if (fmt.sampleFormat === 'float') {
    for (let n = 0; n < frames; n++) {
      for (let c = 0; c < nch; c++) {
        if (bytesPer === 4) v.setFloat32(at, channels[c][n], true);
        else v.setFloat64(at, channels[c][n], true);
        at += bytesPer;
      }
    }
    return bytes;
  }
  const neg = Math.pow(2, fmt.bitDepth - 1);
  const pos = neg - 1;
  for (let n = 0; n < frames; n++) {
    for (let c = 0; c < nch; c++) {
      const x = channels[c][n];
      let q = x < 0 ? Math.round(x * neg) : Math.round(x * pos);
      if (q < -neg) q = -neg;
      else if (q > pos) q = pos;
      switch (bytesPer) {
        case 1:
          v.setUint8(at, q + 128);
          break;
        case 2:
          v.setInt16(at, q, true);
          break;
        case 3:
          v.setUint8(at, q & 0xff);
          v.setUint8(at + 1, (q >> 8) & 0xff);
          v.setUint8(at + 2, (q >> 16) & 0xff);
          break;
        default:
          v.setInt32(at, q, true);
      }
      at += bytesPer;
    }
  }
  return bytes;
}

/** A whole WAV file: header + samples (+ a pad byte for an odd data length). */
export function encodeWav(channels: readonly Float32Array[], fmt: Omit<WavWriteFormat, 'channels'> & { channels?: number }): Uint8Array {
  const full = { ...fmt, channels: fmt.channels ?? channels.length };
  const frames = channels[0]?.length ?? 0;
  const header = wavHeader(full, frames);
  const dataBytes = frames * full.channels * (full.bitDepth / 8);
  const out = new Uint8Array(header.length + dataBytes + (dataBytes & 1));
  out.set(header, 0);
  encodeWavSamples(channels, full, frames, out.subarray(header.length, header.length + dataBytes));
  return out;
}
