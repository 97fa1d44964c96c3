import { parentPort } from 'node:worker_threads';
import { measureBus, type BusMeasurement } from '../../shared/dsp/headroom-report';

/** A bus or a lane to measure, in shared memory (posted without a copy), and the hit times (s) to take window peaks at. */
export interface MeasureJob {
  id: number;
  channels: Float32Array[];
  sampleRateHz: number;
  hitTimesSec: number[];
}

export type MeasureReply = { id: number; measurement: BusMeasurement } | { id: number; error: string } | { ready: true };

// One job at a time, in the order posted.
const port = parentPort!;
port.on('message', (job: MeasureJob) => {
  try {
    port.postMessage({ id: job.id, measurement: measureBus(job.channels, job.sampleRateHz, job.hitTimesSec) } satisfies MeasureReply);
  } catch (e) {
    port.postMessage({ id: job.id, error: e instanceof Error ? (e.stack ?? e.message) : String(e) } satisfies MeasureReply);
  }
});
port.postMessage({ ready: true } satisfies MeasureReply);
