/**
 * RIFF/WAVE chunk table: find `fmt ` and `data`, validate their sizes and the
 * format, without touching the samples. Pure: bytes come from a reader
 * callback, so the server can walk a file on disk without loading it and the
 * browser can walk an ArrayBuffer.
 *
 * Layout per Microsoft/IBM "Multimedia Programming Interface and Data
 * Specifications 1.0" (1991) and Microsoft's WAVEFORMATEXTENSIBLE
 * documentation (from memory): `RIFF` size `WAVE`, then chunks of
 * id(4) size(4, little-endian) body, padded to an even length.
 */

/** Why a WAV header was refused; the server turns it into its HTTP error. */
export class WavFormatError extends Error {
  constructor(
    public readonly code: string,
    public readonly status: 400 | 415 | 422,
    message: string,
  ) {
    super(message);
    this.name = 'WavFormatError';
  }
}

export type WavSampleFormat = 'int' | 'float';

/** Where the samples are and how they are coded. Byte offsets are from the file start. */
export interface WavLayout {
  /** Tag as written in the file (0x0001, 0x0003 or 0xFFFE). */
  formatTag: number;
  /** Tag of the samples: the SubFormat GUID's first two bytes for extensible files. */
  codecTag: number;
  sampleFormat: WavSampleFormat;
  channels: number;
  sampleRateHz: number;
  /** Container bits per sample (8, 16, 24, 32, 64). */
  bitsPerSample: number;
  /** Bytes per frame (all channels of one sample instant). */
  blockAlign: number;
  dataOffsetBytes: number;
  /** Length of the data chunk rounded down to whole frames. */
  dataBytes: number;
  frames: number;
}

/** Reads `length` bytes at `offset`; may return fewer at the end of the file. */
export type ByteReader = (offsetBytes: number, length: number) => Uint8Array;

const CODEC_NAMES: Record<number, string> = {
  0x0002: 'Microsoft ADPCM',
  0x0006: 'A-law',
  0x0007: 'µ-law',
  0x0011: 'IMA ADPCM',
  0x0031: 'GSM 6.10',
  0x0050: 'MPEG',
  0x0055: 'MP3',
  0x00ff: 'AAC',
  0x0161: 'WMA',
  0x2000: 'AC-3',
};

const ascii = (b: Uint8Array, at: number): string =>
  String.fromCharCode(b[at] ?? 0, b[at + 1] ?? 0, b[at + 2] ?? 0, b[at + 3] ?? 0);
const u16 = (b: Uint8Array, at: number): number => (b[at] ?? 0) | ((b[at + 1] ?? 0) << 8);
const u32 = (b: Uint8Array, at: number): number =>
  ((b[at] ?? 0) | ((b[at + 1] ?? 0) << 8) | ((b[at + 2] ?? 0) << 16)) + (b[at + 3] ?? 0) * 0x1000000;

/** Names what a non-WAV file most likely is, for a helpful message. */
export function sniffNonWav(head: Uint8Array): { code: string; what: string } {
  const id = ascii(head, 0);
  // MP3: an ID3v2 tag or an MPEG frame sync (11 set bits).
  if (id.startsWith('ID3') || ((head[0] ?? 0) === 0xff && ((head[1] ?? 0) & 0xe0) === 0xe0)) {
    return { code: 'audio.unsupported_codec', what: 'MP3 audio' };
  }
  if (id === 'fLaC') return { code: 'audio.unsupported_codec', what: 'FLAC audio' };
  if (id === 'OggS') return { code: 'audio.unsupported_codec', what: 'Ogg audio' };
  if (id === 'FORM') return { code: 'audio.unsupported_codec', what: 'AIFF audio' };
  if (id === 'RIFX') return { code: 'audio.unsupported_codec', what: 'big-endian RIFX WAV' };
  if (id === 'MThd') return { code: 'audio.not_wav', what: 'a MIDI file' };
  return { code: 'audio.not_wav', what: 'not a RIFF/WAVE file' };
}

/**
 * Walks the chunk table and returns the sample layout.
 * Errors (WavFormatError): `audio.empty` (zero bytes, 400), `audio.not_wav`
 * (415), `audio.unsupported_codec` (415), `audio.truncated` (400: the file is
 * shorter than its RIFF size says and a needed chunk is cut), `audio.chunk_past_end`
 * (400: a chunk's size runs past the end of a file whose RIFF size does not
 * claim the missing bytes), `audio.bad_fmt` (400), `audio.no_data` (400),
 * `audio.no_channels` (422), `audio.no_samples` (422).
 */
export function readWavLayout(read: ByteReader, fileSizeBytes: number): WavLayout {
  if (fileSizeBytes === 0) throw new WavFormatError('audio.empty', 400, 'The file is empty (0 bytes).');
  const head = read(0, 12);
  if (head.length < 12 || ascii(head, 0) !== 'RIFF' || ascii(head, 8) !== 'WAVE') {
    if (head.length >= 4 && ascii(head, 0) === 'RIFF' && head.length < 12) {
      throw new WavFormatError('audio.truncated', 400, `The file is truncated: ${fileSizeBytes} bytes, shorter than a RIFF header.`);
    }
    const guess = sniffNonWav(head);
    throw new WavFormatError(guess.code, 415, `Not a WAV file (${guess.what}); upload a PCM or float WAV.`);
  }
  const riffEnd = 8 + u32(head, 4);
  const claimsMore = riffEnd > fileSizeBytes;
  const pastEnd = (what: string, end: number): WavFormatError =>
    claimsMore
      ? new WavFormatError('audio.truncated', 400, `The file is truncated: ${what} needs ${end} bytes, the file has ${fileSizeBytes}.`)
      : new WavFormatError('audio.chunk_past_end', 400, `Corrupt WAV: ${what} runs to byte ${end}, past the end of the file (${fileSizeBytes} bytes).`);

  let fmt: Uint8Array | null = null;
  let offset = 12;
  while (offset + 8 <= fileSizeBytes) {
    const header = read(offset, 8);
    if (header.length < 8) break;
    const id = ascii(header, 0);
    const size = u32(header, 4);
    const bodyStart = offset + 8;
    const bodyEnd = bodyStart + size;
    if (id === 'fmt ') {
      if (bodyEnd > fileSizeBytes) throw pastEnd('the fmt chunk', bodyEnd);
      if (size < 16) throw new WavFormatError('audio.bad_fmt', 400, `Corrupt WAV: fmt chunk of ${size} bytes (at least 16 expected).`);
      fmt = read(bodyStart, Math.min(size, 40));
    } else if (id === 'data') {
      if (!fmt) throw new WavFormatError('audio.bad_fmt', 400, 'Corrupt WAV: the data chunk comes before any fmt chunk.');
      if (bodyEnd > fileSizeBytes) throw pastEnd('the data chunk', bodyEnd);
      return layoutFrom(fmt, bodyStart, size);
    }
    // Chunks are padded to an even length (RIFF 1991).
    offset = bodyEnd + (size & 1);
    if (offset > fileSizeBytes && id !== 'fmt ') throw pastEnd(`the '${printable(id)}' chunk`, bodyEnd);
  }
  if (claimsMore || offset < fileSizeBytes) {
    throw new WavFormatError('audio.truncated', 400, `The file is truncated: it ends (at ${fileSizeBytes} bytes) before ${fmt ? 'the data chunk' : 'the fmt chunk'}.`);
  }
  throw new WavFormatError('audio.no_data', 400, `Corrupt WAV: no ${fmt ? 'data' : 'fmt'} chunk.`);
}

function printable(id: string): string {
  return id.replace(/[^\x20-\x7e]/g, '?');
}

function layoutFrom(fmt: Uint8Array, dataOffsetBytes: number, dataSizeBytes: number): WavLayout {
  const formatTag = u16(fmt, 0);
  const channels = u16(fmt, 2);
  const sampleRateHz = u32(fmt, 4);
  const blockAlign = u16(fmt, 12);
  const bitsPerSample = u16(fmt, 14);
  let codecTag = formatTag;
  if (formatTag === 0xfffe) {
    // WAVE_FORMAT_EXTENSIBLE: cbSize(2) validBits(2) channelMask(4) SubFormat GUID(16);
    // the GUID's first two bytes are the plain format tag.
    if (fmt.length < 40) throw new WavFormatError('audio.bad_fmt', 400, `Corrupt WAV: extensible fmt chunk of ${fmt.length} bytes (40 expected).`);
    codecTag = u16(fmt, 24);
  }
  if (codecTag !== 1 && codecTag !== 3) {
    const name = CODEC_NAMES[codecTag] ?? `format tag 0x${codecTag.toString(16).padStart(4, '0')}`;
    throw new WavFormatError('audio.unsupported_codec', 415, `Unsupported WAV codec: ${name}; export the stem as PCM or float WAV.`);
  }
  if (channels === 0) throw new WavFormatError('audio.no_channels', 422, 'The WAV file declares 0 channels.');
  const sampleFormat: WavSampleFormat = codecTag === 3 ? 'float' : 'int';
  const okBits = sampleFormat === 'float' ? [32, 64] : [8, 16, 24, 32];
  if (!okBits.includes(bitsPerSample)) {
    throw new WavFormatError('audio.unsupported_codec', 415, `Unsupported WAV sample size: ${bitsPerSample}-bit ${sampleFormat}.`);
  }
  if (sampleRateHz < 1000 || sampleRateHz > 768000) {
    throw new WavFormatError('audio.bad_fmt', 400, `Corrupt WAV: sample rate ${sampleRateHz} Hz.`);
  }
  if (blockAlign !== (channels * bitsPerSample) / 8) {
    throw new WavFormatError('audio.bad_fmt', 400, `Corrupt WAV: block align ${blockAlign} for ${channels} × ${bitsPerSample}-bit.`);
  }
  const frames = Math.floor(dataSizeBytes / blockAlign);
  if (frames === 0) throw new WavFormatError('audio.no_samples', 422, 'The WAV file holds no samples.');
  return {
    formatTag,
    codecTag,
    sampleFormat,
    channels,
    sampleRateHz,
    bitsPerSample,
    blockAlign,
    dataOffsetBytes,
    dataBytes: frames * blockAlign,
    frames,
  };
}

/** readWavLayout over bytes already in memory. */
export function readWavLayoutFromBytes(bytes: Uint8Array): WavLayout {
  return readWavLayout((offset, length) => bytes.subarray(offset, offset + length), bytes.length);
}
