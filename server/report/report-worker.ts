import { parentPort } from 'node:worker_threads';
import { measureBus, phaseOfMonos, type BusMeasurement, type HeadroomInput, type HeadroomResult } from '../../shared/dsp/headroom-report';

/** Work for the worker, its signals in shared memory (posted without a copy). */
export type ReportJob =
  /** A bus or a lane to measure, and the hit times (s) to take window peaks at. */
  | { id: number; kind: 'bus'; channels: Float32Array[]; sampleRateHz: number; hitTimesSec: number[] }
  /** The phase check of one lane on mono mixes the worker may overwrite. */
  | { id: number; kind: 'phase'; laneId: string; hits: HeadroomInput['hits']; sampleRateHz: number; kickMono: Float32Array; bassMono: Float32Array };

export type ReportReply =
  | { id: number; bus: BusMeasurement }
  | { id: number; phase: NonNullable<HeadroomResult['phase']> }
  | { id: number; error: string }
  | { ready: true };

// One job at a time, in the order posted.
const port = parentPort!;
port.on('message', (job: ReportJob) => {
  try {
    if (job.kind === 'bus') port.postMessage({ id: job.id, bus: measureBus(job.channels, job.sampleRateHz, job.hitTimesSec) } satisfies ReportReply);
    else port.postMessage({ id: job.id, phase: phaseOfMonos(job.laneId, job.hits, job.sampleRateHz, job.kickMono, job.bassMono, [job.kickMono, job.bassMono]) } satisfies ReportReply);
  } catch (e) {
    port.postMessage({ id: job.id, error: e instanceof Error ? (e.stack ?? e.message) : String(e) } satisfies ReportReply);
  }
});
port.postMessage({ ready: true } satisfies ReportReply);
