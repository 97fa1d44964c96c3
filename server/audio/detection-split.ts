import { closeSync, openSync, readSync } from 'node:fs';
import { isMainThread, parentPort, Worker, workerData } from 'node:worker_threads';
import type { WavLayout } from '../../shared/formats/wav-header';
import { decodeMonoBlockInto, decodeStereo24QuadMeansInto, wavDataBlocks } from '../../shared/formats/wav-read';
import { createLowBandBuilder, pushGroupMeans, pushLowBand, type LowBand, type LowBandBuilder } from '../../shared/dsp/low-band';
import { ONSET_BLOCK_FRAMES, predictionOnsetFrames, type PredictionOnsetFunction } from '../../shared/dsp/onset-function';
import { refineCandidates, refinementReach, type Candidate, type RefinedOnset } from '../../shared/dsp/onsets';
import { MEDIAN_STRIDE, movingMedianInto } from '../../shared/dsp/peak-pick';
import type { DetectionOptions } from '../../shared/schemas/hit';
import { AudioInputError } from './audio-errors';

/**
 * Kick detection on two cores: the main thread decodes and analyses the
 * first part of the song while a worker thread does the rest (decoding, the
 * low band and its onset function are two thirds of the work); then each
 * refines half of the candidates, split where the halves cannot depend on
 * each other (shared/dsp/onsets.ts independentFrom).
 *
 * The worker starts its filters `WARM_UP_SEC` before its part and discards
 * what they give there: an 8th-order Butterworth at 120 Hz forgets its start
 * within ~0.2 s (its slowest pole decays by e every ~7 ms), so after a second
 * the two halves join exactly as one pass would. The split falls on the onset
 * function's block grid (ONSET_BLOCK_FRAMES), where its sums restart anyway.
 *
 * Neither thread keeps the full-rate mono mixdown (writing 58 MB of fresh
 * memory was a tenth of the time; each first-touched page costs ~10 µs on
 * this machine): refinement reads only a window around each candidate, so
 * each thread decodes those windows again, one at a time, into a small
 * scratch array (refineFromFile). The one-thread path
 * (server/audio/kick-detection.ts) reads the same way, with decodeRangeSync
 * and refineFromFile from here.
 * The equality with the single-thread path is a test
 * (test/reference/detection-split.test.ts). Opt-in (detectKickFile's
 * `threads: 2`, the CLI's `--threads 2`): on this project's 2-vCPU machine
 * two busy threads each ran ~30 % slower than one alone and the worker
 * starts ~100 ms late, so the split saved nothing (docs/engine.md).
 */

/** Filter warm-up of the worker before its part of the song, seconds. */
const WARM_UP_SEC = 1;
/**
 * Share of the song the main thread takes: a little over half, since the
 * worker starts ~100 ms later and warms its filters up first.
 */
const MAIN_SHARE = 0.57;
/**
 * Bytes per read while decoding for detection: 256 KiB keeps the block and
 * its decoded samples in the core's cache (1 MiB blocks decoded ~30 % slower
 * here). Blocks hold a multiple of 64 frames, so the low band's groups
 * (shared/dsp/low-band.ts) never straddle two blocks.
 */
const READ_BLOCK_BYTES = 1 << 18;
const BLOCK_FRAME_MULTIPLE = 64;
/** Frames of the priming call in decodeRangeSync (a multiple of 64, and 4-byte aligned for every frame size). */
const PRIME_FRAMES = 1024;
const TASK = 'tuckline-detection-tail';

/** What the worker computes: the song from frame `from` to the end. */
export interface TailJob {
  path: string;
  layout: WavLayout;
  /** First frame decoded: `from` less the warm-up (a multiple of 2·factor). */
  warmFrom: number;
  from: number;
  bandHz: number;
  hopSamples: number;
  fitSamples: number;
  windowSamples: number;
  /** Half-width of the threshold's moving median, frames (shared/dsp/onsets.ts medianRadiusFrames). */
  medianRadius: number;
}

export interface TailResult {
  /** Low-band samples from index from / factor to the end of the song. */
  band: Float32Array;
  /** Onset-function frames from from / (factor·hop) to the end. */
  riseDb: Float32Array;
  innovation: Float64Array;
  /** The moving median from frame `medianFrom` (a grid centre whose window lies in the tail) to the end. */
  median: Float32Array;
  medianFrom: number;
}

/** Where the song is split: frame S on the grid factor·hop·ONSET_BLOCK_FRAMES a little past the middle; null when the song is too short to split (about one grid unit, ~8 s at 48 kHz). */
export function splitPlan(layout: WavLayout, factor: number, hopSamples: number): { from: number; warmFrom: number } | null {
  const frames = layout.frames;
  const unit = factor * hopSamples * ONSET_BLOCK_FRAMES;
  const from = Math.min(Math.round((frames * MAIN_SHARE) / unit), Math.floor(frames / unit)) * unit;
  const pairUnit = 2 * factor;
  const warmFrom = from - Math.ceil((WARM_UP_SEC * layout.sampleRateHz) / pairUnit) * pairUnit;
  if (from <= 0 || from >= frames || warmFrom < 0) return null;
  return { from, warmFrom };
}

/** Whether this module runs from TypeScript sources (tsx, the tests) rather than the built command line. */
function fromSources(): boolean {
  return import.meta.url.endsWith('.ts');
}

/**
 * Decodes frames [from, to) of a WAV file with positioned synchronous reads
 * (no thread-pool round trip per block) into a low-band builder, through one
 * reused block buffer. Throws AudioInputError when the file shrank meanwhile.
 */
export function decodeRangeSync(path: string, layout: WavLayout, from: number, to: number, builder: LowBandBuilder): void {
  const blockFrames = Math.max(BLOCK_FRAME_MULTIPLE, Math.floor(READ_BLOCK_BYTES / layout.blockAlign / BLOCK_FRAME_MULTIPLE) * BLOCK_FRAME_MULTIPLE);
  const bytes = new Uint8Array(blockFrames * layout.blockAlign);
  const block = new Float32Array(blockFrames);
  // Stereo 24-bit decodes straight to the low band's four-frame means; other layouts through the mono mixdown.
  const quads = builder.preFactor === 4 && layout.channels === 2 && layout.bitsPerSample === 24 && layout.sampleFormat === 'int';
  const push = (part: Uint8Array): void => {
    if (quads) {
      const groups = decodeStereo24QuadMeansInto(layout, part, block, 0);
      if (groups >= 0 && pushGroupMeans(builder, block.subarray(0, groups))) return;
    }
    const n = decodeMonoBlockInto(layout, part, block, 0);
    pushLowBand(builder, block.subarray(0, n));
  };
  const fd = openSync(path, 'r');
  try {
    let primed = false;
    for (const [offset, length] of wavDataBlocks(layout, bytes.length, from, to)) {
      readExactly(fd, bytes, length, offset);
      let at = 0;
      if (!primed) {
        // The first 1024 frames on their own: the short call runs every path
        // of the decoder and the filters once before the long one gets
        // optimised mid-loop, which otherwise meets operations it has no type
        // feedback for and falls back to the interpreter for the rest of a
        // block. Same samples either way.
        primed = true;
        at = Math.min(length, PRIME_FRAMES * layout.blockAlign);
        push(bytes.subarray(0, at));
      }
      push(bytes.subarray(at, length));
    }
  } finally {
    closeSync(fd);
  }
}

function readExactly(fd: number, bytes: Uint8Array, length: number, offset: number): void {
  const read = readSync(fd, bytes, 0, length, offset);
  if (read < length) throw new AudioInputError('audio.truncated', 400, `The file is truncated: it shrank while being read (${offset + read} bytes).`);
}

/**
 * The stretches of the song refinement reads for candidates [from, to):
 * refinementReach around each candidate's frame, overlapping ones merged.
 * Each is [first frame, end frame, first candidate, end candidate).
 */
export function refinementWindows(layout: WavLayout, candidates: readonly Candidate[], from: number, to: number): Array<[number, number, number, number]> {
  const reach = refinementReach(layout.sampleRateHz);
  const windows: Array<[number, number, number, number]> = [];
  for (let k = from; k < to; k++) {
    const s = candidates[k]!.frameSample;
    const lo = Math.max(0, s - reach.before);
    const hi = Math.min(layout.frames, s + reach.after);
    const last = windows[windows.length - 1];
    if (last && lo <= last[1]) {
      last[1] = Math.max(last[1], hi);
      last[3] = k + 1;
    } else windows.push([lo, hi, k, k + 1]);
  }
  return windows;
}

/**
 * Refinement (shared/dsp/onsets.ts refineCandidates) of candidates [from, to)
 * straight from the file: each window of refinementWindows is decoded into
 * one reused scratch array and its candidates refined there, so the
 * full-rate mixdown is never held (on this machine first touching a
 * song-length array cost more than decoding into it). Gives what
 * refineCandidates gives on the whole mixdown (test/reference/detection-split.test.ts).
 */
export function refineFromFile(
  path: string,
  layout: WavLayout,
  band: LowBand,
  candidates: readonly Candidate[],
  from: number,
  to: number,
  previousEnd: number,
  opts: DetectionOptions,
): RefinedOnset[] {
  const kept: RefinedOnset[] = [];
  const fd = openSync(path, 'r');
  let bytes = new Uint8Array(0);
  let mono = new Float32Array(0);
  try {
    for (const [lo, hi, k0, k1] of refinementWindows(layout, candidates, from, to)) {
      const frames = hi - lo;
      const length = frames * layout.blockAlign;
      if (bytes.length < length) {
        bytes = new Uint8Array(Math.max(length, 2 * bytes.length));
        mono = new Float32Array(bytes.length / layout.blockAlign);
      }
      readExactly(fd, bytes, length, layout.dataOffsetBytes + lo * layout.blockAlign);
      decodeMonoBlockInto(layout, bytes.subarray(0, length), mono, 0);
      const refined = refineCandidates({ samples: mono.subarray(0, frames), start: lo }, band, candidates, k0, k1, previousEnd, layout.sampleRateHz, opts);
      for (const r of refined) kept.push(r);
      if (refined.length > 0) previousEnd = refined[refined.length - 1]!.sample + 1;
    }
  } finally {
    closeSync(fd);
  }
  return kept;
}

/**
 * Decodes frames [warmFrom, end) of the file, builds the low band and
 * computes the onset function of the tail. Runs in the worker, or on the
 * main thread when a worker cannot be started.
 */
export function analyseTail(job: TailJob): TailResult {
  const { layout } = job;
  const frames = layout.frames;
  const builder = createLowBandBuilder(layout.sampleRateHz, frames - job.warmFrom, job.bandHz);
  decodeRangeSync(job.path, layout, job.warmFrom, frames, builder);
  const factor = builder.factor;
  const xStart = job.warmFrom / factor;
  const x = builder.out.subarray(0, builder.written);
  const totalSamples = xStart + builder.written;
  const totalFrames = Math.ceil(totalSamples / job.hopSamples);
  const frameFrom = job.from / (factor * job.hopSamples);
  const count = Math.max(0, totalFrames - frameFrom);
  const odf: PredictionOnsetFunction = {
    hopSamples: job.hopSamples,
    riseDb: new Float32Array(count),
        innovation: new Float64Array(count),
  };
  predictionOnsetFrames(x, xStart, totalSamples, job.hopSamples, job.fitSamples, job.windowSamples, frameFrom, totalFrames, odf, frameFrom);
  const medianFrom = Math.min(totalFrames, Math.ceil((frameFrom + job.medianRadius) / MEDIAN_STRIDE) * MEDIAN_STRIDE);
  const median = new Float32Array(totalFrames - medianFrom);
  movingMedianInto(odf.riseDb, frameFrom, totalFrames, job.medianRadius, MEDIAN_STRIDE, medianFrom, totalFrames, median, medianFrom);
  return { band: x.slice((job.from - job.warmFrom) / factor), riseDb: odf.riseDb, innovation: odf.innovation, median, medianFrom };
}

/** The second phase: refine candidates [from, end) of the song's list on the worker (previousEnd 0; see independentFrom). */
export interface RefineRequest {
  candidates: Candidate[];
  from: number;
  /** The joined low band (the worker's own starts at the warm-up). */
  band: LowBand;
  opts: DetectionOptions;
}

/** A worker that analyses the tail of the song, then may refine the second half of the candidates. */
export interface TailWorker {
  tail: Promise<TailResult>;
  refine(request: RefineRequest): Promise<RefinedOnset[]>;
  /** Lets the worker go (when no refinement is asked for). */
  close(): void;
  /** Which phases the worker did (the rest fell back to this thread); for tests and diagnostics. */
  done: { tail: boolean; refine: boolean };
}

/** Refines candidates [from, end) with previousEnd 0 (see independentFrom), straight from the file. */
export function refineTail(job: TailJob, request: RefineRequest): RefinedOnset[] {
  const { candidates, from, band, opts } = request;
  return refineFromFile(job.path, job.layout, band, candidates, from, candidates.length, 0, opts);
}

/**
 * Runs analyseTail (and later one refinement) on a worker thread. The worker
 * is this very module: it sees its task in workerData (below). From
 * TypeScript sources (the server under tsx, the tests) the worker registers
 * tsx first. Whatever the worker cannot do (it fails to start, or dies), the main
 * thread does itself, so the result never depends on threads; an unusable
 * file fails the same way on the main thread.
 */
export function startTailWorker(job: TailJob): TailWorker {
  let worker: Worker | null = null;
  try {
    worker = fromSources()
      ? // tsx's loader hooks do not reach a worker through execArgv; register them in it first.
        new Worker(`import(${JSON.stringify(import.meta.resolve('tsx/esm/api'))}).then((m) => { m.register(); return import(${JSON.stringify(import.meta.url)}); })`, {
          eval: true,
          workerData: { task: TASK, job },
        })
      : new Worker(new URL(import.meta.url), { workerData: { task: TASK, job } });
  } catch {
    worker = null;
  }
  // Each phase resolves from the worker's message, or on this thread when the worker is gone.
  let pending: { kind: 'tail' | 'refined'; settle: (message: WorkerMessage | null) => void } | null = null;
  let dead = worker === null;
  let early: WorkerMessage | null = null;
  const onGone = (): void => {
    dead = true;
    const p = pending;
    pending = null;
    p?.settle(null);
  };
  worker?.on('message', (message: WorkerMessage) => {
    if (pending && pending.kind === message.kind) {
      const p = pending;
      pending = null;
      p.settle(message);
    } else early = message;
  });
  worker?.once('error', onGone);
  worker?.once('exit', onGone);
  const next = (kind: 'tail' | 'refined'): Promise<WorkerMessage | null> =>
    new Promise((resolve) => {
      if (early && early.kind === kind) {
        const m = early;
        early = null;
        return resolve(m);
      }
      if (dead) return resolve(null);
      pending = { kind, settle: resolve };
    });
  const done = { tail: false, refine: false };
  const tail = next('tail').then((m) => {
    if (m && m.kind === 'tail') {
      done.tail = true;
      return m.result;
    }
    return analyseTail(job);
  });
  return {
    tail,
    done,
    async refine(request) {
      // Posted before the first await: the caller goes on refining its own
      // half synchronously, and a post queued behind an await would wait for it.
      if (!dead && worker && done.tail) worker.postMessage(request);
      else {
        await tail;
        if (!dead && worker) worker.postMessage(request);
      }
      const m = await next('refined');
      void worker?.terminate();
      if (m && m.kind === 'refined') {
        done.refine = true;
        return m.kept;
      }
      return refineTail(job, request);
    },
    close() {
      void worker?.terminate();
    },
  };
}

type WorkerMessage = { kind: 'tail'; result: TailResult } | { kind: 'refined'; kept: RefinedOnset[] };

if (!isMainThread && (workerData as { task?: string } | null)?.task === TASK && parentPort) {
  const port = parentPort;
  const job = (workerData as { job: TailJob }).job;
  const result = analyseTail(job);
  const message: WorkerMessage = { kind: 'tail', result };
  port.postMessage(message, [result.band.buffer, result.riseDb.buffer, result.innovation.buffer, result.median.buffer] as ArrayBuffer[]);
  port.once('message', (request: RefineRequest) => {
    const reply: WorkerMessage = { kind: 'refined', kept: refineTail(job, request) };
    port.postMessage(reply);
    port.close();
  });
}
