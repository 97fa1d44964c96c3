import { Worker } from 'node:worker_threads';
import { busFrames, busWidth, levelFigures, sumStemsInto } from '../../shared/dsp/headroom';
import { assembleHeadroomResult, tuckedLanes, type BusMeasurement, type HeadroomInput, type HeadroomResult } from '../../shared/dsp/headroom-report';
import { mixdownInto } from '../../shared/dsp/mixdown';
import type { ReportJob, ReportReply } from './report-worker';

/** A Float32Array in shared memory: posted to the worker without a copy. */
const sharedChannel = (frames: number) => new Float32Array(new SharedArrayBuffer(frames * Float32Array.BYTES_PER_ELEMENT));

/** A job as posted, without the id the computer gives it. */
type Job = Omit<Extract<ReportJob, { kind: 'bus' }>, 'id'> | Omit<Extract<ReportJob, { kind: 'phase' }>, 'id'>;
type Phase = NonNullable<HeadroomResult['phase']>;

/**
 * The headroom report on two threads, the same steps and figures as
 * shared/dsp/headroom-report.ts computeHeadroomReport (tested). This thread
 * makes every derived signal in shared memory — the tucked lanes, the mono
 * kick and bass for the phase check, the buses before and after — and hands
 * each to the worker as soon as it exists; then it measures the lanes' stems
 * as given while the worker measures the rest.
 *
 * The worker starts with the computer and is reused; it keeps the process
 * alive only while it has work. If it fails, the reports waiting on it fail
 * with its error and the next report starts a new one.
 */
export function createReportComputer() {
  let worker: Worker | null = null;
  let ready: Promise<void> = Promise.resolve();
  let nextId = 0;
  const waiting = new Map<number, { resolve: (reply: ReportReply) => void; reject: (e: Error) => void }>();

  function start(): Worker {
    const w = new Worker(new URL('./report-worker-boot.mjs', import.meta.url));
    w.unref();
    let markReady = () => {};
    ready = new Promise((resolve) => (markReady = resolve));
    w.on('message', (reply: ReportReply) => {
      if ('ready' in reply) return markReady();
      const job = waiting.get(reply.id);
      waiting.delete(reply.id);
      if ('error' in reply) job?.reject(new Error(`report worker: ${reply.error}`));
      else job?.resolve(reply);
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

  function post(job: Job): Promise<ReportReply> {
    worker ??= start();
    const id = nextId++;
    const done = new Promise<ReportReply>((resolve, reject) => waiting.set(id, { resolve, reject }));
    // Kept referenced while it has work, so a script awaiting a report does not exit under it.
    worker.ref();
    worker.postMessage({ ...job, id } as ReportJob);
    return done;
  }
  const measureBus = (channels: Float32Array[], sampleRateHz: number, hitTimesSec: number[]) =>
    post({ kind: 'bus', channels, sampleRateHz, hitTimesSec }).then((r) => (r as { bus: BusMeasurement }).bus);

  return {
    async compute(input: HeadroomInput): Promise<HeadroomResult> {
      const fs = input.sampleRateHz;
      const hitTimes = input.hits.map((h) => h.timeSec);
      const afters = tuckedLanes(input, sharedChannel);
      const lanesAfter = afters.map((after) => measureBus(after, fs, []));
      // The phase check's mono mixes, copies the worker may filter in place (computeHeadroomReport's firstLanePhase).
      const first = input.lanes[0];
      const monoCopy = (channels: readonly Float32Array[]) => {
        const mono = sharedChannel(channels[0]?.length ?? 0);
        mixdownInto(channels, mono);
        return mono;
      };
      const phase = first
        ? post({ kind: 'phase', laneId: first.id, hits: input.hits, sampleRateHz: fs, kickMono: monoCopy(input.kick), bassMono: monoCopy(first.bass) }).then((r) => (r as { phase: Phase }).phase)
        : Promise.resolve(null);
      const bus = (stems: readonly (readonly Float32Array[])[]) =>
        sumStemsInto(stems, Array.from({ length: busWidth(stems) }, () => sharedChannel(busFrames(stems))));
      const before = measureBus(bus([input.kick, ...input.lanes.map((l) => l.bass)]), fs, hitTimes);
      const after = measureBus(bus([input.kick, ...afters]), fs, hitTimes);
      // Meanwhile, here: the lanes' stems as given.
      const lanesBefore = input.lanes.map((l) => levelFigures(l.bass, fs));
      // One await for all, so a failing job always has a handler.
      const [measured, sumBefore, sumAfter, lanePhase] = await Promise.all([Promise.all(lanesAfter), before, after, phase]);
      return assembleHeadroomResult(input, {
        lanes: lanesBefore.map((b, i) => ({ before: b, after: measured[i].figures })),
        before: sumBefore,
        after: sumAfter,
        phase: lanePhase,
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
