import { open, readFile, stat } from 'node:fs/promises';
import type { DetectionOptions, Hit, MidiKickOptions } from '../../shared/schemas/hit';
import { withDetectionDefaults } from '../../shared/schemas/hit-defaults';
import { detectOnsetsWithLowBand } from '../../shared/dsp/onsets';
import { createLowBandBuilder, finishLowBand, lowBandLength, pushLowBand, type LowBandBuilder } from '../../shared/dsp/low-band';
import { findCandidates, finishHits, independentFrom, medianRadiusFrames, onsetGeometry, type Candidate } from '../../shared/dsp/onsets';
import { MEDIAN_STRIDE, movingMedianInto } from '../../shared/dsp/peak-pick';
import { ONSET_BLOCK_FRAMES, predictionOnsetFrames, predictionOnsetFunction, type PredictionOnsetFunction } from '../../shared/dsp/onset-function';
import { decodeRangeSync, refineFromFile, splitPlan, startTailWorker } from './detection-split';
import { MidiFormatError, readMidiKicks } from '../../shared/formats/midi-read';
import { sniffNonWav } from '../../shared/formats/wav-header';
import { AudioInputError } from './audio-errors';
import { decodeMonoInto, openWav, type MonoDecoder, type OpenWav } from './wav-file';

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
  /**
   * 1 (default): one thread. 2: the song is split between this thread and a
   * worker (server/audio/detection-split.ts) when it is long enough (~8 s
   * at 48 kHz); the hits are the same. On this project's 2-vCPU machine the
   * second thread did not pay (a 5-minute stem: 0.53 s against 0.48 s on
   * one, docs/engine.md), so it is not the default.
   */
  threads?: 1 | 2;
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
  const detection = withDetectionDefaults(opts.detection);
  const wav = await openWav(path);
  try {
    const { frames, sampleRate } = wav.info;
    const band = createLowBandBuilder(sampleRate, frames, detection.lowBandHz);
    const decoder = opts.decoder ?? 'direct';
    const threads = opts.threads ?? 1;
    const geometry = onsetGeometry(band.rateHz);
    const plan = decoder === 'direct' && threads === 2 ? splitPlan(wav.layout, band.factor, geometry.hopSamples) : null;
    if (plan) return { source: 'audio', sampleRate, durationSec: wav.info.durationSec, hits: await detectOnTwoThreads(path, wav, band, geometry, plan, detection) };
    if (decoder === 'wav-decoder') {
      // The reference path: every block through wav-decoder into a full mono mixdown.
      const mono = new Float32Array(frames);
      await decodeMonoInto(wav, mono, decoder, (first, n) => pushLowBand(band, mono.subarray(first, first + n)));
      const hits = detectOnsetsWithLowBand(mono, finishLowBand(band), sampleRate, detection);
      return { source: 'audio', sampleRate, durationSec: wav.info.durationSec, hits };
    }
    // One thread, the same steps as the two-thread path: the low band while
    // decoding (synchronous positioned reads), then the full-rate signal only
    // around the candidates. Gives what detectOnsets gives on the whole
    // mixdown (test/reference/onsets.test.ts), without holding it.
    decodeRangeSync(path, wav.layout, 0, frames, band);
    const lowBand = finishLowBand(band);
    const odf = predictionOnsetFunction(lowBand.samples, geometry.hopSamples, geometry.fitSamples, geometry.windowSamples);
    const candidates = findCandidates(lowBand, odf, detection);
    const kept = refineFromFile(path, wav.layout, lowBand, candidates, 0, candidates.length, 0, detection);
    return { source: 'audio', sampleRate, durationSec: wav.info.durationSec, hits: finishHits(kept, lowBand, sampleRate, detection) };
  } finally {
    await wav.close();
  }
}

/**
 * The two-thread path (server/audio/detection-split.ts): the worker takes
 * frames from plan.from on, this thread the rest; then the joins of the low
 * band and of the onset function, and each thread refines half of the
 * candidates. Gives exactly what detectOnsetsWithLowBand gives on one thread.
 */
async function detectOnTwoThreads(
  path: string,
  wav: OpenWav,
  band: LowBandBuilder,
  geometry: ReturnType<typeof onsetGeometry>,
  plan: { from: number; warmFrom: number },
  detection: DetectionOptions,
): Promise<Hit[]> {
  const { frames, sampleRate } = wav.info;
  const medianRadius = medianRadiusFrames(band.rateHz, geometry.hopSamples);
  const helper = startTailWorker({ path, layout: wav.layout, ...plan, bandHz: detection.lowBandHz, ...geometry, medianRadius });
  helper.tail.catch(() => undefined); // awaited below; a failure meanwhile must not go unhandled
  try {
    decodeRangeSync(path, wav.layout, 0, plan.from, band);
    const total = lowBandLength(band, frames);
    const hop = geometry.hopSamples;
    const totalFrames = Math.ceil(total / hop);
    const odf: PredictionOnsetFunction = { hopSamples: hop, riseDb: new Float32Array(totalFrames), innovation: new Float64Array(totalFrames) };
    const headFrames = plan.from / (band.factor * hop);
    // Every block but the last before the split reads only this thread's samples.
    const early = Math.max(0, headFrames - ONSET_BLOCK_FRAMES);
    predictionOnsetFrames(band.out, 0, total, hop, geometry.fitSamples, geometry.windowSamples, 0, early, odf, 0);
    // The threshold's moving median: the grid centres whose window ends before `early` now, the worker's from its result, the rest after the join.
    const median = new Float32Array(totalFrames);
    const preTo = early - medianRadius;
    movingMedianInto(odf.riseDb, 0, totalFrames, medianRadius, MEDIAN_STRIDE, 0, preTo, median, 0);
    const rest = await helper.tail;
    band.out.set(rest.band, band.written);
    band.written += rest.band.length;
    if (band.written !== total) throw new Error(`detection split: low band of ${band.written} samples, expected ${total}`);
    predictionOnsetFrames(band.out, 0, total, hop, geometry.fitSamples, geometry.windowSamples, early, headFrames, odf, 0);
    odf.riseDb.set(rest.riseDb, headFrames);
    odf.innovation.set(rest.innovation, headFrames);
    movingMedianInto(odf.riseDb, 0, totalFrames, medianRadius, MEDIAN_STRIDE, preTo, rest.medianFrom, median, 0);
    median.set(rest.median, rest.medianFrom);
    const lowBand = finishLowBand(band);
    const candidates = findCandidates(lowBand, odf, detection, undefined, median);
    const cut = refineSplit(candidates, sampleRate, detection) ?? candidates.length;
    const second = cut < candidates.length ? helper.refine({ candidates, from: cut, band: lowBand, opts: detection }) : Promise.resolve([]);
    if (cut === candidates.length) helper.close();
    second.catch(() => undefined);
    // Refinement reads the signal only near the candidates: decode just that.
    const first = refineFromFile(path, wav.layout, lowBand, candidates, 0, cut, 0, detection);
    return finishHits([...first, ...(await second)], lowBand, sampleRate, detection);
  } finally {
    helper.close();
  }
}

/** The candidate nearest the middle from which the rest refines on its own (independentFrom); null when none is within the middle half. */
function refineSplit(candidates: readonly Candidate[], sampleRateHz: number, opts: DetectionOptions): number | null {
  const n = candidates.length;
  const mid = n >> 1;
  for (let d = 0; d <= n >> 2; d++) {
    if (independentFrom(candidates, mid + d, sampleRateHz, opts)) return mid + d;
    if (d > 0 && independentFrom(candidates, mid - d, sampleRateHz, opts)) return mid - d;
  }
  return null;
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
