import { describe, expect, it } from 'vitest';
import { sampleGainCurve } from './gain';
import { applyGains, levelFigures, sumStems, sumStemsInto, windowPeakDbfs } from './headroom';
import { computeHeadroomReport, HIT_WINDOW } from './headroom-report';
import { mixdownInto } from './mixdown';
import { phaseCheck } from './phase-check';
import type { GainCurve } from './gain-curve';

const fs = 48_000;
let seed = 11;
const rand = () => ((seed = (seed * 1664525 + 1013904223) >>> 0) / 4294967296) * 2 - 1;
const hitTimes = [0.25, 0.75, 1.25, 1.75];
/** A 2 s scene: a stereo kick of decaying 55 Hz bursts, a mono sub and a stereo bass with hiss. */
function scene() {
  const n = 2 * fs;
  const kickL = new Float32Array(n);
  for (const t of hitTimes) for (let i = 0; i < 0.2 * fs; i++) kickL[Math.round(t * fs) + i] += 0.7 * Math.sin((2 * Math.PI * 55 * i) / fs) * Math.exp(-i / (0.08 * fs));
  const kickR = kickL.map((v) => 0.8 * v + 0.01 * rand());
  const sub = Float32Array.from({ length: n }, (_, i) => 0.5 * Math.sin((2 * Math.PI * 49 * i) / fs));
  const bassL = Float32Array.from({ length: n }, (_, i) => 0.3 * Math.sin((2 * Math.PI * 98 * i) / fs) + 0.02 * rand());
  const duck: GainCurve = { points: hitTimes.flatMap((t) => [{ timeSec: t - 0.003, gainDb: 0 }, { timeSec: t, gainDb: -30 }, { timeSec: t + 0.05, gainDb: -30 }, { timeSec: t + 0.15, gainDb: 0 }]) };
  return {
    kick: [kickL, kickR],
    lanes: [
      { id: 'sub', name: 'Sub', bass: [sub], curve: duck },
      { id: 'bass', name: 'Bass', bass: [bassL, bassL.map((v) => -v)], curve: duck },
    ],
    hits: hitTimes.map((timeSec, i) => ({ id: `h${i}`, timeSec })),
  };
}

describe('computeHeadroomReport (known by construction: the plain composition of its parts)', () => {
  it('equals every figure measured on fresh sums, with its buffer reuse changing nothing', () => {
    const input = { sampleRateHz: fs, ...scene() };
    const copies = [input.kick, ...input.lanes.map((l) => l.bass)].map((stem) => stem.map((ch) => ch.slice()));
    const report = computeHeadroomReport(input);

    const afters = input.lanes.map((l) => applyGains(l.bass, sampleGainCurve(l.curve, l.bass[0].length, fs)));
    const before = sumStems([input.kick, ...input.lanes.map((l) => l.bass)]);
    const after = sumStems([input.kick, ...afters]);
    expect(report.sum).toEqual({ before: levelFigures(before, fs), after: levelFigures(after, fs) });
    expect(report.lanes).toEqual(input.lanes.map((l, i) => ({ laneId: l.id, name: l.name, before: levelFigures(l.bass, fs), after: levelFigures(afters[i], fs) })));
    const window = (bus: Float32Array[], t: number) => windowPeakDbfs(bus, fs, t - HIT_WINDOW.beforeSec, t + HIT_WINDOW.afterSec);
    expect(report.perHit).toEqual(input.hits.map((h) => ({ hitId: h.id, timeSec: h.timeSec, beforeDbfs: window(before, h.timeSec), afterDbfs: window(after, h.timeSec) })));
    const kickMono = new Float32Array(input.kick[0].length);
    mixdownInto(input.kick, kickMono);
    const phase = phaseCheck(kickMono, input.lanes[0].bass[0], fs, hitTimes);
    expect(report.phase).toEqual({ laneId: 'sub', hits: phase.hits.map((p, i) => ({ ...p, hitId: `h${i}` })), suggestion: phase.suggestion });
    // The stems passed in are left as they were.
    [input.kick, ...input.lanes.map((l) => l.bass)].forEach((stem, s) => stem.forEach((ch, c) => expect(Array.from(ch)).toEqual(Array.from(copies[s][c]))));
  });

  it('sumStemsInto overwrites a used bus with exactly what sumStems makes', () => {
    const { kick, lanes } = scene();
    const stems = [kick, lanes[0].bass, lanes[1].bass];
    const bus = sumStems([kick, lanes[1].bass]);
    sumStemsInto(stems, bus);
    expect(bus.map((ch) => Array.from(ch))).toEqual(sumStems(stems).map((ch) => Array.from(ch)));
  });
});
