import { open, stat } from 'node:fs/promises';
import type { FileHandle } from 'node:fs/promises';
import WavDecoder from 'wav-decoder';
import { readWavLayout, WavFormatError, type WavLayout } from '../../shared/formats/wav-header';
import { decodeMonoBlockInto, PLAIN_WAV_HEADER_BYTES, wavDataBlocks, writePlainWavHeader } from '../../shared/formats/wav-read';
import { mixdownInto } from '../../shared/dsp/mixdown';
import { biquadLowpassCascade, processCascadeInPlace, cascadeState } from '../../shared/dsp/biquad';
import { AudioInputError } from './audio-errors';
import { audioInfoFromLayout, type AudioInfo } from './audio-info-from-layout';

/**
 * Bytes of the data chunk decoded per step. wav-decoder on a whole 86 MB file
 * holds about 690 MB (TOOLCHAIN.md); 1 MiB blocks keep its garbage small.
 */
const BLOCK_BYTES = 1 << 20;

/** Reads the chunk table of an open file through positioned reads. */
async function layoutOf(handle: FileHandle, sizeBytes: number): Promise<WavLayout> {
  // The chunk walk is synchronous (shared/ is pure); prefetch the first 64 KiB,
  // which holds fmt and the data header in practice, and fall back to
  // positioned reads for chunk tables that run further.
  const headLength = Math.min(sizeBytes, 1 << 16);
  const head = new Uint8Array(headLength);
  if (headLength > 0) await handle.read(head, 0, headLength, 0);
  const far: Array<{ at: number; bytes: Uint8Array }> = [];
  const misses: Array<[number, number]> = [];
  const reader = (offset: number, length: number): Uint8Array => {
    if (offset + length <= headLength) return head.subarray(offset, offset + length);
    const hit = far.find((f) => f.at === offset && f.bytes.length >= Math.min(length, sizeBytes - offset));
    if (hit) return hit.bytes.subarray(0, length);
    misses.push([offset, length]);
    throw new NeedBytes();
  };
  // Retry the walk after fetching each missing span; a chunk table has few entries.
  for (let attempt = 0; attempt < 10_000; attempt++) {
    try {
      return readWavLayout(reader, sizeBytes);
    } catch (e) {
      if (!(e instanceof NeedBytes)) throw e;
      const [at, length] = misses.pop()!;
      const bytes = new Uint8Array(Math.max(0, Math.min(length, sizeBytes - at)));
      if (bytes.length > 0) await handle.read(bytes, 0, bytes.length, at);
      far.push({ at, bytes });
    }
  }
  throw new AudioInputError('audio.bad_fmt', 400, 'Corrupt WAV: the chunk table has too many chunks.');
}

class NeedBytes extends Error {}

function toInputError(e: unknown): never {
  if (e instanceof WavFormatError) throw new AudioInputError(e.code, e.status, e.message);
  throw e;
}

export interface OpenWav {
  info: AudioInfo;
  layout: WavLayout;
  /** Decodes the data chunk block by block with wav-decoder; each call gets channel arrays and the first frame's index. */
  forEachBlock(visit: (channels: Float32Array[], firstFrame: number) => void): Promise<void>;
  /** Reads the data chunk block by block as raw bytes of whole frames (reused buffer; copy to keep). */
  forEachRawBlock(visit: (bytes: Uint8Array, firstFrame: number) => void): Promise<void>;
  close(): Promise<void>;
}

/** Opens a WAV file on disk and validates its header; samples are read later, in blocks. */
export async function openWav(path: string): Promise<OpenWav> {
  const sizeBytes = (await stat(path)).size;
  const handle = await open(path, 'r');
  let layout: WavLayout;
  try {
    layout = await layoutOf(handle, sizeBytes).catch(toInputError);
  } catch (e) {
    await handle.close();
    throw e;
  }
  const info = audioInfoFromLayout(layout);
  return {
    info,
    layout,
    async forEachBlock(visit) {
      // One reusable buffer: a synthetic plain WAV (44-byte header + one block)
      // that wav-decoder decodes as if it were a small file.
      // wav-decoder reads only as many bytes as the header's data size says,
      // so the last, shorter block needs no trimmed copy.
      const buffer = new ArrayBuffer(PLAIN_WAV_HEADER_BYTES + BLOCK_BYTES);
      const bytes = new Uint8Array(buffer);
      let firstFrame = 0;
      for (const [offset, length] of wavDataBlocks(layout, BLOCK_BYTES)) {
        const { bytesRead } = await handle.read(bytes, PLAIN_WAV_HEADER_BYTES, length, offset);
        if (bytesRead < length) {
          throw new AudioInputError('audio.truncated', 400, `The file is truncated: it shrank while being read (${offset + bytesRead} bytes).`);
        }
        writePlainWavHeader(layout, length, bytes);
        const decoded = WavDecoder.decode.sync(buffer);
        visit(decoded.channelData, firstFrame);
        firstFrame += decoded.length;
      }
    },
    async forEachRawBlock(visit) {
      const bytes = new Uint8Array(BLOCK_BYTES);
      let firstFrame = 0;
      for (const [offset, length] of wavDataBlocks(layout, BLOCK_BYTES)) {
        const { bytesRead } = await handle.read(bytes, 0, length, offset);
        if (bytesRead < length) {
          throw new AudioInputError('audio.truncated', 400, `The file is truncated: it shrank while being read (${offset + bytesRead} bytes).`);
        }
        visit(bytes.subarray(0, length), firstFrame);
        firstFrame += length / layout.blockAlign;
      }
    },
    close: () => handle.close(),
  };
}

/**
 * How mono is decoded: 'direct' mixes the PCM bytes straight down
 * (shared/formats/wav-read.ts, same scaling as wav-decoder, ~10× faster);
 * 'wav-decoder' decodes each block with wav-decoder, then mixes down.
 * The reference tests check that both give the same samples.
 */
export type MonoDecoder = 'direct' | 'wav-decoder';

/** Streams a WAV file's mono mixdown block by block into `mono`, calling `onBlock` after each. */
export async function decodeMonoInto(wav: OpenWav, mono: Float32Array, decoder: MonoDecoder, onBlock: (first: number, frames: number) => void): Promise<void> {
  if (decoder === 'wav-decoder') {
    await wav.forEachBlock((block, first) => {
      mixdownInto(block, mono, first);
      onBlock(first, block[0]!.length);
    });
    return;
  }
  await wav.forEachRawBlock((bytes, first) => {
    const frames = decodeMonoBlockInto(wav.layout, bytes, mono, first);
    onBlock(first, frames);
  });
}

/** Decodes a whole WAV file into one Float32Array per channel (linear, full scale ±1). */
export async function readWavFile(path: string): Promise<{ info: AudioInfo; channels: Float32Array[] }> {
  const wav = await openWav(path);
  try {
    const channels = Array.from({ length: wav.info.channels }, () => new Float32Array(wav.info.frames));
    await wav.forEachBlock((block, first) => {
      for (let c = 0; c < block.length; c++) channels[c]!.set(block[c]!, first);
    });
    return { info: wav.info, channels };
  } finally {
    await wav.close();
  }
}

/**
 * Decodes a WAV file into its mono mixdown (mean of the channels), block by
 * block, so only one Float32Array of the file's length is held. With
 * `lowpassHz` the mixdown also goes through a 4th-order Butterworth low-pass
 * (shared/dsp/biquad.ts), state carried across blocks.
 */
export async function readWavMono(path: string, opts: { lowpassHz?: number; decoder?: MonoDecoder } = {}): Promise<{ info: AudioInfo; mono: Float32Array }> {
  const wav = await openWav(path);
  try {
    const mono = new Float32Array(wav.info.frames);
    const cascade = opts.lowpassHz ? biquadLowpassCascade(opts.lowpassHz, wav.info.sampleRate, 4) : null;
    const state = cascade ? cascadeState(cascade) : null;
    await decodeMonoInto(wav, mono, opts.decoder ?? 'direct', (first, frames) => {
      if (cascade && state) processCascadeInPlace(cascade, state, mono.subarray(first, first + frames));
    });
    return { info: wav.info, mono };
  } finally {
    await wav.close();
  }
}
