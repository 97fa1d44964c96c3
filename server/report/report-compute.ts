import { Worker } from 'node:worker_threads';
import { busFrames, busWidth, levelFigures, sumStemsInto } from '../../shared/dsp/headroom';
import {
  assembleHeadroomResult,
  firstLanePhase,
  tuckedLanes,
  type BusMeasurement,
  type HeadroomInput,
  type HeadroomResult,
} from '../../shared/dsp/headroom-report';
import type { MeasureJob, MeasureReply } from './report-worker';

/** A Float32Array in shared memory: posted to the worker without a copy. */
const sharedChannel = (frames: number) => new Float32Array(new SharedArrayBuffer(frames * Float32Array.BYTES_PER_ELEMENT));

/**
 * The headroom report on two threads, the same steps and figures as
 * shared/dsp/headroom-report.ts computeHeadroomReport (tested): this thread
 * makes the tucked lanes and the two buses in shared memory and hands each to
 * a worker to measure as soon as it exists, then measures the stems as given
 * and runs the phase check while the worker works.
 *
 * The worker starts with the computer and is reused; it keeps the process
 * alive only while it has work. If it fails, the reports waiting on it fail with its error
 * and the next report starts a new one.
 */
export function createReportComputer() {
  let worker: Worker | null = null;
  let nextId = 0;
  const waiting = new Map<number, { resolve: (m: BusMeasurement) => void; reject: (e: Error) => void }>();

  let ready: Promise<void>;

  function start(): Worker {
    const w = new Worker(new URL('./report-worker-boot.mjs', import.meta.url));
    w.unref();
    let markReady = () => {};
    ready = new Promise((resolve) => (markReady = resolve));
    w.on('message', (reply: MeasureReply) => {
      if ('ready' in reply) return markReady();
      const job = waiting.get(reply.id);
      waiting.delete(reply.id);
      if ('error' in reply) job?.reject(new Error(`report worker: ${reply.error}`));
      else job?.resolve(reply.measurement);
      if (!waiting.size) w.unref();
    });
    const fail = (e: Error) => {
      if (worker === w) worker = null;
      for (const job of waiting.values()) job.reject(e);
      waiting.clear();
    };
    w.on('error', fail);
    w.on('exit', (code) => fail(new Error(`report worker exited with code ${code}`)));
    return w;
  }
  worker = start();

  function measureOnWorker(channels: Float32Array[], sampleRateHz: number, hitTimesSec: number[]): Promise<BusMeasurement> {
    worker ??= start();
    const id = nextId++;
    const done = new Promise<BusMeasurement>((resolve, reject) => waiting.set(id, { resolve, reject }));
    // Kept referenced while it has work, so a script awaiting a report does not exit under it.
    worker.ref();
    worker.postMessage({ id, channels, sampleRateHz, hitTimesSec } satisfies MeasureJob);
    return done;
  }

  return {
    async compute(input: HeadroomInput): Promise<HeadroomResult> {
      const fs = input.sampleRateHz;
      const hitTimes = input.hits.map((h) => h.timeSec);
      const afters = tuckedLanes(input, sharedChannel);
      const lanesAfter = afters.map((after) => measureOnWorker(after, fs, []));
      const bus = (stems: readonly (readonly Float32Array[])[]) =>
        sumStemsInto(stems, Array.from({ length: busWidth(stems) }, () => sharedChannel(busFrames(stems))));
      const before = measureOnWorker(bus([input.kick, ...input.lanes.map((l) => l.bass)]), fs, hitTimes);
      const after = measureOnWorker(bus([input.kick, ...afters]), fs, hitTimes);
      // Meanwhile, here: the stems as given, and the phase check.
      const lanesBefore = input.lanes.map((l) => levelFigures(l.bass, fs));
      const phase = firstLanePhase(input);
      // One await for all, so a failing job always has a handler.
      const [measured, sumBefore, sumAfter] = await Promise.all([Promise.all(lanesAfter), before, after]);
      return assembleHeadroomResult(input, {
        lanes: lanesBefore.map((b, i) => ({ before: b, after: measured[i].figures })),
        before: sumBefore,
        after: sumAfter,
        phase,
      });
    },
    /** Settles once the current worker has loaded its code (a server need not wait for it: jobs queue meanwhile). */
    ready: () => ready,
    /** Stops the worker (a report under way fails). */
    async close(): Promise<void> {
      const w = worker;
      worker = null;
      await w?.terminate();
    },
  };
}
export type ReportComputer = ReturnType<typeof createReportComputer>;
