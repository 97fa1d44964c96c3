import { afterAll, describe, expect, it } from 'vitest';
import { computeHeadroomReport, type HeadroomInput } from '../../shared/dsp/headroom-report';
import type { GainCurve } from '../../shared/dsp/gain-curve';
import { createReportComputer } from './report-compute';

const fs = 48_000;
let seed = 29;
const rand = () => ((seed = (seed * 1664525 + 1013904223) >>> 0) / 4294967296) * 2 - 1;
const hitTimes = [0.25, 0.75, 1.25, 1.75];

/** A 2 s scene: stereo kick bursts, a mono sub lane and a stereo bass lane with hiss, both ducked at every hit. */
function scene(): HeadroomInput {
  const n = 2 * fs;
  const kickL = new Float32Array(n);
  for (const t of hitTimes) for (let i = 0; i < 0.2 * fs; i++) kickL[Math.round(t * fs) + i] += 0.7 * Math.sin((2 * Math.PI * 55 * i) / fs) * Math.exp(-i / (0.08 * fs));
  const bassL = Float32Array.from({ length: n }, (_, i) => 0.3 * Math.sin((2 * Math.PI * 98 * i) / fs) + 0.02 * rand());
  const duck: GainCurve = { points: hitTimes.flatMap((t) => [{ timeSec: t - 0.003, gainDb: 0 }, { timeSec: t, gainDb: -30 }, { timeSec: t + 0.05, gainDb: -30 }, { timeSec: t + 0.15, gainDb: 0 }]) };
  return {
    sampleRateHz: fs,
    kick: [kickL, kickL.map((v) => 0.8 * v + 0.01 * rand())],
    lanes: [
      { id: 'sub', name: 'Sub', bass: [Float32Array.from({ length: n }, (_, i) => 0.5 * Math.sin((2 * Math.PI * 49 * i) / fs))], curve: duck },
      { id: 'bass', name: 'Bass', bass: [bassL, bassL.map((v) => -0.5 * v)], curve: duck },
    ],
    hits: hitTimes.map((timeSec, i) => ({ id: `h${i}`, timeSec })),
  };
}

describe('report on two threads (known by construction: the single-thread report, figure for figure)', () => {
  const computer = createReportComputer();
  afterAll(() => computer.close());

  it('gives exactly the report computeHeadroomReport gives', async () => {
    const input = scene();
    expect(await computer.compute(input)).toEqual(computeHeadroomReport(input));
  });

  it('serves reports one after another and side by side from the same worker', async () => {
    const a = scene();
    const b = { ...scene(), lanes: scene().lanes.slice(1) };
    const [ra, rb] = await Promise.all([computer.compute(a), computer.compute(b)]);
    expect(ra).toEqual(computeHeadroomReport(a));
    expect(rb).toEqual(computeHeadroomReport(b));
  });

  it('starts a new worker for the next report once closed', async () => {
    const input = scene();
    await computer.close();
    expect(await computer.compute(input)).toEqual(computeHeadroomReport(input));
  });
});
