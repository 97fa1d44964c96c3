import { open, readFile, stat } from 'node:fs/promises';
import { detectionOptionsSchema, type DetectionOptions, type Hit, type MidiKickOptions } from '../../shared/schemas/hit';
import { detectOnsetsWithLowBand } from '../../shared/dsp/onsets';
import { createLowBandBuilder, finishLowBand, pushLowBand } from '../../shared/dsp/low-band';
import { MidiFormatError, readMidiKicks } from '../../shared/formats/midi-read';
import { sniffNonWav } from '../../shared/formats/wav-header';
import { AudioInputError } from './audio-errors';
import { decodeMonoInto, openWav, type MonoDecoder } from './wav-file';

export interface DetectionResult {
  source: 'audio' | 'midi';
  /** Sample rate of the audio source; null for MIDI. */
  sampleRate: number | null;
  durationSec: number;
  hits: Hit[];
}

export interface DetectKickOptions {
  /** Omitted: sniffed from the first bytes (RIFF/WAVE or MThd). */
  kind?: 'audio' | 'midi';
  detection?: Partial<DetectionOptions>;
  midi?: Partial<MidiKickOptions>;
  /** WAV decoding path (server/audio/wav-file.ts); 'direct' unless told. */
  decoder?: MonoDecoder;
}

/** MIDI files above this are refused before reading (an SMF of a song is kilobytes). */
const MIDI_MAX_BYTES = 16 << 20;

async function sniff(path: string): Promise<'audio' | 'midi'> {
  const handle = await open(path, 'r');
  try {
    const head = new Uint8Array(12);
    const { bytesRead } = await handle.read(head, 0, 12, 0);
    const id = String.fromCharCode(...head.subarray(0, 4));
    if (id === 'MThd') return 'midi';
    if (bytesRead === 0) throw new AudioInputError('audio.empty', 400, 'The file is empty (0 bytes).');
    if (id === 'RIFF') return 'audio';
    const guess = sniffNonWav(head.subarray(0, bytesRead));
    throw new AudioInputError(guess.code, 415, `Not a WAV or MIDI file (${guess.what}).`);
  } finally {
    await handle.close();
  }
}

/**
 * Finds the kick hits of a kick source on disk: a WAV kick stem (decoded
 * block by block into a mono mixdown and its low band, then
 * shared/dsp/onsets.ts) or a MIDI file of the kick part
 * (shared/formats/midi-read.ts). Throws AudioInputError for unusable files.
 */
export async function detectKickFile(path: string, opts: DetectKickOptions = {}): Promise<DetectionResult> {
  const kind = opts.kind ?? (await sniff(path));
  if (kind === 'midi') return detectMidi(path, opts.midi);
  const detection = detectionOptionsSchema.parse(opts.detection ?? {});
  const wav = await openWav(path);
  try {
    const { frames, sampleRate } = wav.info;
    const mono = new Float32Array(frames);
    const band = createLowBandBuilder(sampleRate, frames, detection.lowBandHz);
    await decodeMonoInto(wav, mono, opts.decoder ?? 'direct', (first, n) => pushLowBand(band, mono.subarray(first, first + n)));
    const hits = detectOnsetsWithLowBand(mono, finishLowBand(band), sampleRate, detection);
    return { source: 'audio', sampleRate, durationSec: wav.info.durationSec, hits };
  } finally {
    await wav.close();
  }
}

async function detectMidi(path: string, midi: Partial<MidiKickOptions> | undefined): Promise<DetectionResult> {
  const size = (await stat(path)).size;
  if (size > MIDI_MAX_BYTES) throw new AudioInputError('midi.too_large', 413, `The MIDI file is ${size} bytes; at most ${MIDI_MAX_BYTES} are accepted.`);
  const bytes = new Uint8Array(await readFile(path));
  try {
    const kicks = readMidiKicks(bytes, midi);
    return { source: 'midi', sampleRate: null, durationSec: kicks.durationSec, hits: kicks.hits };
  } catch (e) {
    if (e instanceof MidiFormatError) throw new AudioInputError(e.code, e.status, e.message);
    throw e;
  }
}
