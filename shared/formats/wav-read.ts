import type { WavLayout } from './wav-header';

/** Size of the canonical 44-byte header: RIFF(12) + fmt(8+16) + data(8). */
export const PLAIN_WAV_HEADER_BYTES = 44;

/**
 * Writes a canonical 44-byte WAV header for `dataBytes` bytes of `layout`'s
 * samples, with the plain format tag (1 PCM, 3 float) instead of 0xFFFE.
 * Decoders that refuse WAVE_FORMAT_EXTENSIBLE (wav-decoder 1.3.0) read the
 * same samples under the plain tag, because the SubFormat GUID's first two
 * bytes are that tag (WAVEFORMATEXTENSIBLE; /work/shared/TOOLCHAIN.md
 * "Audio and MIDI libraries"). Writing into `out` (at `at`) lets the caller
 * place a block of the data chunk right after it without another copy.
 */
export function writePlainWavHeader(layout: WavLayout, dataBytes: number, out: Uint8Array, at = 0): void {
  const v = new DataView(out.buffer, out.byteOffset + at, PLAIN_WAV_HEADER_BYTES);
  const tag = (s: string, pos: number): void => {
    for (let i = 0; i < 4; i++) v.setUint8(pos + i, s.charCodeAt(i));
  };
  tag('RIFF', 0);
  v.setUint32(4, 36 + dataBytes, true);
  tag('WAVE', 8);
  tag('fmt ', 12);
  v.setUint32(16, 16, true);
  v.setUint16(20, layout.codecTag, true);
  v.setUint16(22, layout.channels, true);
  v.setUint32(24, layout.sampleRateHz, true);
  v.setUint32(28, layout.sampleRateHz * layout.blockAlign, true);
  v.setUint16(32, layout.blockAlign, true);
  v.setUint16(34, layout.bitsPerSample, true);
  tag('data', 36);
  v.setUint32(40, dataBytes, true);
}

/**
 * Splits the data chunk into blocks of whole frames of about `targetBytes`
 * each, so a block decodes on its own. Returns [offsetBytes, lengthBytes]
 * pairs relative to the file start; `fromFrame`/`toFrame` limit them to a range of frames.
 */
export function wavDataBlocks(layout: WavLayout, targetBytes = 1 << 20, fromFrame = 0, toFrame = layout.frames): Array<[number, number]> {
  const framesPerBlock = Math.max(1, Math.floor(targetBytes / layout.blockAlign));
  const blockBytes = framesPerBlock * layout.blockAlign;
  const blocks: Array<[number, number]> = [];
  const first = Math.max(0, fromFrame) * layout.blockAlign;
  const end = Math.min(layout.frames, toFrame) * layout.blockAlign;
  for (let done = first; done < end; done += blockBytes) {
    blocks.push([layout.dataOffsetBytes + done, Math.min(blockBytes, end - done)]);
  }
  return blocks;
}

/**
 * Decodes one block of a data chunk (whole frames) straight into its mono
 * mixdown, out[offset + i] = (1/C)·Σc sample(i, c), without per-channel
 * arrays. Same scaling as wav-decoder 1.3.0 (so both paths agree to float32
 * rounding; stereo 24-bit within 1.2·10⁻⁷, see decodeStereo24Into): integers divide by 2^(b−1) when negative and 2^(b−1) − 1 when
 * positive; 8-bit is offset binary (x − 128); floats pass through.
 * The speed path for detection: wav-decoder's per-sample DataView reads
 * take ~1.4 s for a 5-minute 48 kHz stereo 24-bit file, this ~0.1 s.
 * @param layout the validated layout (shared/formats/wav-header.ts)
 * @param block bytes of whole frames from the data chunk
 * @param out mono destination, linear full scale ±1
 * @param offset first index of `out` written
 * @returns frames decoded
 */
export function decodeMonoBlockInto(layout: WavLayout, block: Uint8Array, out: Float32Array, offset: number): number {
  const c = layout.channels;
  const frames = Math.floor(block.length / layout.blockAlign);
  const scale = 1 / c;
  const view = new DataView(block.buffer, block.byteOffset, block.byteLength);
  const bytes = layout.bitsPerSample / 8;
  if (layout.sampleFormat === 'float') {
    for (let i = 0, at = 0; i < frames; i++) {
      let sum = 0;
      for (let ch = 0; ch < c; ch++, at += bytes) sum += bytes === 4 ? view.getFloat32(at, true) : view.getFloat64(at, true);
      out[offset + i] = sum * scale;
    }
    return frames;
  }
  const neg = 2 ** (layout.bitsPerSample - 1);
  const pos = neg - 1;
  const invNeg = 1 / neg;
  const invPos = 1 / pos;
  const norm = (v: number): number => (v < 0 ? v * invNeg : v * invPos);
  // Multiplying by 1/(2^(b−1) − 1) instead of dividing differs from wav-decoder by at most one double ulp.
  if (bytes === 3 && c === 2) return decodeStereo24Into(block, frames, out, offset);
  if (bytes === 3) {
    for (let i = 0, at = 0; i < frames; i++) {
      let sum = 0;
      for (let ch = 0; ch < c; ch++, at += 3) {
        const u = block[at]! | (block[at + 1]! << 8) | (block[at + 2]! << 16);
        // wav-decoder treats 0x800000 itself as positive (xx > 0x800000); kept for agreement.
        const v = u > 0x800000 ? u - 0x1000000 : u;
        sum += v < 0 ? v * invNeg : v * invPos;
      }
      out[offset + i] = sum * scale;
    }
    return frames;
  }
  for (let i = 0, at = 0; i < frames; i++) {
    let sum = 0;
    for (let ch = 0; ch < c; ch++, at += bytes) {
      const v = bytes === 2 ? view.getInt16(at, true) : bytes === 4 ? view.getInt32(at, true) : view.getUint8(at) - 128;
      sum += bytes === 1 ? (v < 0 ? v / 128 : v / 127) : norm(v);
    }
    out[offset + i] = sum * scale;
  }
  return frames;
}

/**
 * decodeMonoBlockInto for the common stem format, stereo 24-bit, branch-free:
 * sign extension by shifts and one scale, (v0 + v1) / 2 / 2^23. Positive
 * samples read at most 1.2·10⁻⁷ (one part in 2^23) below wav-decoder's
 * v / (2^23 − 1); unpredictable sign branches cost more than the rest of the loop.
 */
function decodeStereo24Into(block: Uint8Array, frames: number, out: Float32Array, offset: number): number {
  const scale = 0.5 / 8388608;
  let i = 0;
  if (LITTLE_ENDIAN && block.byteOffset % 4 === 0) {
    // Two frames are 12 bytes, three 32-bit words: s0 = w0[0..23], s1 = w0[24..31]|w1[0..15],
    // s2 = w1[16..31]|w2[0..7], s3 = w2[8..31]; `<< 8 >> 8` sign-extends 24 bits.
    const words = new Int32Array(block.buffer, block.byteOffset, Math.floor((frames * 6) / 4));
    for (let k = 0; i + 1 < frames; i += 2, k += 3) {
      const w0 = words[k]!;
      const w1 = words[k + 1]!;
      const w2 = words[k + 2]!;
      const s0 = (w0 << 8) >> 8;
      const s1 = (((w0 >>> 24) | (w1 << 8)) << 8) >> 8;
      const s2 = (((w1 >>> 16) | (w2 << 16)) << 8) >> 8;
      const s3 = w2 >> 8;
      out[offset + i] = (s0 + s1) * scale;
      out[offset + i + 1] = (s2 + s3) * scale;
    }
  }
  for (let at = i * 6; i < frames; i++, at += 6) {
    const v0 = ((block[at]! | (block[at + 1]! << 8) | (block[at + 2]! << 16)) << 8) >> 8;
    const v1 = ((block[at + 3]! | (block[at + 4]! << 8) | (block[at + 5]! << 16)) << 8) >> 8;
    out[offset + i] = (v0 + v1) * scale;
  }
  return frames;
}

/**
 * Means of groups of four frames of the mono mixdown, straight from the
 * bytes of a stereo 24-bit block: out[offset + g] = Σ of the eight samples
 * of frames 4g … 4g + 3 / (8·2^23), rounded once to float32 — what
 * decodeMonoBlockInto then a four-sample mean (shared/dsp/low-band.ts)
 * give, to one float32 rounding (equal bit for bit whenever a frame's two
 * samples sum below 2^24). One pass instead of two, and no mono block: the
 * speed path of detection's decode (server/audio/detection-split.ts).
 * Needs a whole number of groups in a 4-byte-aligned block on a
 * little-endian machine; returns the groups decoded, or -1 when this block
 * or layout has no fast path (decode it the general way).
 */
export function decodeStereo24QuadMeansInto(layout: WavLayout, block: Uint8Array, out: Float32Array, offset: number): number {
  const frames = Math.floor(block.length / layout.blockAlign);
  if (!LITTLE_ENDIAN || layout.sampleFormat !== 'int' || layout.bitsPerSample !== 24 || layout.channels !== 2 || frames % 4 !== 0 || block.byteOffset % 4 !== 0) return -1;
  const groups = frames / 4;
  const words = new Int32Array(block.buffer, block.byteOffset, groups * 6);
  const scale = 1 / 67108864; // 1 / (8 · 2^23)
  // Four frames are 24 bytes, six words; each three words hold two frames as in decodeStereo24Into.
  for (let g = 0, k = 0; g < groups; g++, k += 6) {
    const w0 = words[k]!, w1 = words[k + 1]!, w2 = words[k + 2]!;
    const w3 = words[k + 3]!, w4 = words[k + 4]!, w5 = words[k + 5]!;
    const sum =
      ((w0 << 8) >> 8) +
      ((((w0 >>> 24) | (w1 << 8)) << 8) >> 8) +
      ((((w1 >>> 16) | (w2 << 16)) << 8) >> 8) +
      (w2 >> 8) +
      ((w3 << 8) >> 8) +
      ((((w3 >>> 24) | (w4 << 8)) << 8) >> 8) +
      ((((w4 >>> 16) | (w5 << 16)) << 8) >> 8) +
      (w5 >> 8);
    out[offset + g] = sum * scale;
  }
  return groups;
}

/** Int32Array views read little-endian words only on a little-endian machine. */
const LITTLE_ENDIAN = new Uint8Array(Uint16Array.of(1).buffer)[0] === 1;
