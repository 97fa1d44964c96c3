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
 * pairs relative to the file start.
 */
export function wavDataBlocks(layout: WavLayout, targetBytes = 1 << 20): Array<[number, number]> {
  const framesPerBlock = Math.max(1, Math.floor(targetBytes / layout.blockAlign));
  const blockBytes = framesPerBlock * layout.blockAlign;
  const blocks: Array<[number, number]> = [];
  for (let done = 0; done < layout.dataBytes; done += blockBytes) {
    blocks.push([layout.dataOffsetBytes + done, Math.min(blockBytes, layout.dataBytes - done)]);
  }
  return blocks;
}
