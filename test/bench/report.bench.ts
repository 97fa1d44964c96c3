import { computeHeadroomReport } from '../../shared/dsp/headroom-report';
import { stampHits } from '../../shared/dsp/stamp';
import { tuckShapeSchema } from '../../shared/schemas/tuck-shape';
import { defaultLaneShape } from '../../shared/schemas/lane';
import { createReportComputer } from '../../server/report/report-compute';
import type { BenchSection } from './api';

/**
 * The headroom report of a 5-minute stereo 48 kHz song with one lane, in-process
 * (the budget: under 2 s on this machine), on the server's two-thread
 * path and, for comparison, on the CLI's single thread. Synthetic stems: a decaying
 * 55 Hz kick every 16th-note pattern step and a held 49 Hz sub.
 */
export async function benchReport(): Promise<BenchSection> {
  const fs = 48_000;
  const seconds = 300;
  const n = fs * seconds;
  const kickL = new Float32Array(n);
  const bass = new Float32Array(n);
  const hits: { id: string; timeSec: number; strength: number; enabled: boolean }[] = [];
  const step = 60 / 140 / 4;
  for (let t = 0.5, k = 0; t < seconds - 1; t += step, k++) {
    if (![0, 6, 10].includes(k % 16)) continue;
    hits.push({ id: String(hits.length), timeSec: t, strength: 1, enabled: true });
    const s = Math.round(t * fs);
    for (let i = 0; i < 0.3 * fs && s + i < n; i++) kickL[s + i] += 0.7 * Math.sin((2 * Math.PI * 55 * i) / fs) * Math.exp(-i / (0.08 * fs));
  }
  for (let i = 0; i < n; i++) bass[i] = 0.5 * Math.sin((2 * Math.PI * 49 * i) / fs);
  const kick = [kickL, kickL.slice()];
  const shape = tuckShapeSchema.parse(defaultLaneShape);
  const curve = stampHits(hits, shape, { durationSec: seconds }).curve;

  const input = { sampleRateHz: fs, kick, lanes: [{ id: 'lane', name: 'Sub', bass: [bass], curve }], hits };

  // The server's path (server/report/report.service.ts): two threads, the worker started with the
  // service. Measured first, in a fresh process, so neither thread has compiled the DSP yet.
  const started = performance.now();
  const computer = createReportComputer();
  await computer.ready();
  const startMs = performance.now() - started;
  const server = await timed(() => computer.compute(input));
  await computer.close();
  // The CLI's path: one thread (its code already compiled by the run above, so a little flattered).
  const single = await timed(async () => computeHeadroomReport(input));
  const result = server.result;
  const s = (ms: number) => `${(ms / 1000).toFixed(2)} s`;
  return {
    title: 'Headroom report',
    rows: [
      { name: 'full report, 5 min stereo 48 kHz, one lane (wall)', value: s(server.wallMs), note: 'budget 2 s; in-process, stems already decoded; the server\'s two-thread path, worker already started' },
      { name: 'same, CPU time of this process', value: s(server.cpuMs), note: 'user time of both threads' },
      { name: 'worker start-up (once per server)', value: s(startMs), note: 'loading tsx and the DSP code in the worker' },
      { name: 'same report on one thread (wall)', value: s(single.wallMs), note: `the CLI's path; CPU ${s(single.cpuMs)}` },
      { name: 'hits measured', value: String(result.perHit.length), note: `headroom gained ${result.headroomGainedDb.samplePeak.toFixed(2)} dB sample peak, ${result.headroomGainedDb.truePeak.toFixed(2)} dB true peak` },
    ],
  };
}

/** Wall and user CPU time (all threads of the process) of one run. */
async function timed<T>(run: () => Promise<T>): Promise<{ result: T; wallMs: number; cpuMs: number }> {
  const cpu0 = process.cpuUsage();
  const t0 = performance.now();
  const result = await run();
  return { result, wallMs: performance.now() - t0, cpuMs: process.cpuUsage(cpu0).user / 1000 };
}
