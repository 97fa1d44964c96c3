import { Worker } from 'node:worker_threads';
import { busFrames, busWidth, levelFigures, sumStemsInto } from '../../shared/dsp/headroom';
import { assembleHeadroomResult, bufferPool, firstLanePhase, tuckedLanes, type BusMeasurement, type HeadroomInput, type HeadroomResult } from '../../shared/dsp/headroom-report';
import type { MeasureJob, MeasureReply } from './report-worker';

/** A Float32Array in shared memory: posted to the worker without a copy. */
const sharedChannel = (frames: number) => new Float32Array(new SharedArrayBuffer(frames * Float32Array.BYTES_PER_ELEMENT));

/** Marks a promise as handled now (it is awaited later), so its failure meanwhile is not an unhandled rejection. */
function awaitedLater<T>(promise: Promise<T>): Promise<T> {
  promise.catch(() => {});
  return promise;
}

/**
 * The headroom report on two threads, the same steps and figures as
 * shared/dsp/headroom-report.ts computeHeadroomReport (tested). This thread
 * makes the tucked lanes and the bus in shared memory and the worker measures
 * them, while this thread measures the lanes' stems as given and runs the
 * phase check. Fresh memory is dear here (page faults cost about as much as a
 * pass over it), so the bus after the tucks is summed into the bus before's
 * buffers once the worker has measured those, and the phase check reuses the
 * tucked lanes' buffers once the worker is done with them.
 *
 * The worker starts with the computer and is reused; it keeps the process
 * alive only while it has work. If it fails, the reports waiting on it fail
 * with its error and the next report starts a new one.
 */
export function createReportComputer() {
  let worker: Worker | null = null;
  let ready: Promise<void> = Promise.resolve();
  let nextId = 0;
  const waiting = new Map<number, { resolve: (m: BusMeasurement) => void; reject: (e: Error) => void }>();

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
    return awaitedLater(done);
  }

  return {
    async compute(input: HeadroomInput): Promise<HeadroomResult> {
      const fs = input.sampleRateHz;
      const hitTimes = input.hits.map((h) => h.timeSec);
      const afters = tuckedLanes(input, sharedChannel);
      const lanesAfter = awaitedLater(Promise.all(afters.map((after) => measureOnWorker(after, fs, []))));
      const stemsBefore = [input.kick, ...input.lanes.map((l) => l.bass)];
      const bus = Array.from({ length: busWidth(stemsBefore) }, () => sharedChannel(busFrames(stemsBefore)));
      const before = measureOnWorker(sumStemsInto(stemsBefore, bus), fs, hitTimes);
      const lanesBefore = input.lanes.map((l) => levelFigures(l.bass, fs));
      // The tucked lanes have the bass's channels and lengths, so the bus after them fits the same buffers.
      const sumBefore = await before;
      const after = measureOnWorker(sumStemsInto([input.kick, ...afters], bus), fs, hitTimes);
      const measuredAfters = await lanesAfter;
      const phase = firstLanePhase(input, bufferPool(afters.flat()));
      return assembleHeadroomResult(input, {
        lanes: lanesBefore.map((b, i) => ({ before: b, after: measuredAfters[i].figures })),
        before: sumBefore,
        after: await after,
        phase,
      });
    },
    /** Settles once the current worker has loaded its code (a server need not wait: jobs queue meanwhile). */
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
