/**
 * Stamping benchmark (requirement 1): stamp + CSV + MIDI of 2,000 hits in
 * process (budget < 50 ms) and re-stamping 1,000 hits after one breakpoint
 * moves, as the browser does while dragging (budget < 8 ms). Medians of many
 * runs after a warm-up, wall clock (performance.now).
 */
import { stampHits } from '../../shared/dsp/stamp';
import { thinCurve } from '../../shared/dsp/curve-thin';
import { writeBreakpointCsvBytes } from '../../shared/formats/csv-write';
import { writeMidiCc } from '../../shared/formats/midi-write';
import { tuckShapeSchema } from '../../shared/schemas/tuck-shape';
import type { Hit } from '../../shared/schemas/hit';
import type { BenchSection } from './api';


/** A 128 BPM four-to-the-floor part with a double kick (1/16 later) every second bar: `count` hits. */
export function benchHits(count: number): Hit[] {
  const beat = 60 / 128;
  const hits: Hit[] = [];
  for (let b = 0; hits.length < count; b++) {
    hits.push({ timeSec: 0.1 + b * beat, strength: 0.9, enabled: true });
    if (b % 8 === 7 && hits.length < count) hits.push({ timeSec: 0.1 + b * beat + beat / 4, strength: 0.6, enabled: true, depthDb: -18 });
  }
  return hits;
}

function median(xs: number[]): number {
  const s = [...xs].sort((a, b) => a - b);
  return s.length % 2 ? s[(s.length - 1) / 2] : (s[s.length / 2 - 1] + s[s.length / 2]) / 2;
}

/**
 * Wall-clock median and p90 of `runs` calls after `warmup`, plus the median
 * CPU time of this process per call (process.cpuUsage: user + system, all
 * threads, so GC helpers count) — on a shared, loaded machine wall time
 * includes waiting for a core, CPU time does not.
 */
function time(runs: number, warmup: number, fn: (i: number) => void): { median: number; p90: number; cpu: number } {
  for (let i = 0; i < warmup; i++) fn(i);
  const t: number[] = [];
  const c: number[] = [];
  for (let i = 0; i < runs; i++) {
    const c0 = process.cpuUsage();
    const t0 = performance.now();
    fn(i);
    t.push(performance.now() - t0);
    const d = process.cpuUsage(c0);
    c.push((d.user + d.system) / 1000);
  }
  const s = [...t].sort((a, b) => a - b);
  return { median: median(t), p90: s[Math.floor(s.length * 0.9)], cpu: median(c) };
}

const ms = (x: number) => `${x.toFixed(2)} ms`;
const cpu = (r: { cpu: number }) => `CPU ${ms(r.cpu)}`;

export async function benchStamp(): Promise<BenchSection> {
  const drawn = { points: [{ tMs: -3, gainDb: 0 }, { tMs: 0, gainDb: -40 }, { tMs: 50, gainDb: -40 }, { tMs: 150, gainDb: 0 }], slopeGuardMs: 5 };
  const shape = tuckShapeSchema.parse(drawn);
  const hits2000 = benchHits(2000);
  const hits1000 = benchHits(1000);
  const song2000 = hits2000[hits2000.length - 1].timeSec + 1;
  const song1000 = hits1000[hits1000.length - 1].timeSec + 1;

  let points = 0;
  let thinPoints = 0;
  let csvBytes = 0;
  let midiBytes = 0;
  // As the product exports (server/engine/engine.service.ts): the CSV gets the
  // thinned curve (exportCsv), the MIDI file the curve as stamped (exportMidi).
  // Nothing here reads `points`: a curve's point objects are made on first read
  // (packedCurve), and the exports never read them.
  const full = time(40, 8, () => {
    const { curve } = stampHits(hits2000, shape, { durationSec: song2000, baseGainDb: -2 });
    const csv = writeBreakpointCsvBytes(thinCurve(curve), { sampleRate: 48000, bpm: 128 });
    const midi = writeMidiCc([{ name: 'Bass', curve }], { bpm: 128 });
    csvBytes = csv.length;
    midiBytes = midi.length;
  });
  const { curve } = stampHits(hits2000, shape, { durationSec: song2000, baseGainDb: -2 });
  const stampOnly = time(40, 8, () => stampHits(hits2000, shape, { durationSec: song2000, baseGainDb: -2 }));
  const thinOnly = time(40, 8, () => thinCurve(curve));
  const thin = thinCurve(curve);
  const csvOnly = time(40, 8, () => writeBreakpointCsvBytes(thin, { sampleRate: 48000, bpm: 128 }));
  const midiOnly = time(40, 8, () => writeMidiCc([{ name: 'Bass', curve }], { bpm: 128 }));
  // Re-stamp while dragging: each run moves the end of the hold by 0.5 ms, so no template is
  // reused, and reads the points, as the browser's timeline does (src/app/song/workspace/workspace-store.ts).
  const drag = time(100, 20, (i) => {
    const moved = { ...shape, points: shape.points.map((p, k) => (k === 2 ? { ...p, tMs: 50 + ((i % 40) - 20) * 0.5 } : p)) };
    return stampHits(hits1000, moved, { durationSec: song1000, baseGainDb: -2 }).curve.points;
  });
  const render = time(10, 2, () => stampHits(hits2000, shape, { durationSec: song2000, baseGainDb: -2, rampToleranceDb: 0.002 }));
  // Read last: reading a curve's points turns it into objects, which the timed runs above must not meet.
  points = curve.points.length;
  thinPoints = thin.points.length;

  return {
    title: 'Stamping and exports (shared/dsp/stamp.ts, curve-thin.ts, shared/formats/)',
    rows: [
      { name: 'stamp + thin + CSV + MIDI, 2,000 hits', value: ms(full.median), note: `median of 40, p90 ${ms(full.p90)}, ${cpu(full)}; budget < 50 ms` },
      { name: 're-stamp 1,000 hits after one breakpoint moves', value: ms(drag.median), note: `median of 100, p90 ${ms(drag.p90)}, ${cpu(drag)}; budget < 8 ms` },
      { name: 'stamp only, 2,000 hits', value: ms(stampOnly.median), note: `${cpu(stampOnly)}; ${points} breakpoints (ramps within 0.05 dB)` },
      { name: 'thin (RDP, 0.5 dB in dB and amplitude above −40 dB)', value: ms(thinOnly.median), note: `${cpu(thinOnly)}; ${points} → ${thinPoints} breakpoints` },
      { name: 'CSV of the thinned curve', value: ms(csvOnly.median), note: `${cpu(csvOnly)}; ${(csvBytes / 1024).toFixed(0)} KiB` },
      { name: 'MIDI CC file (CC 11, 960 PPQ, sampled per tick)', value: ms(midiOnly.median), note: `${cpu(midiOnly)}; ${(midiBytes / 1024).toFixed(0)} KiB` },
      { name: 'stamp at render precision (0.002 dB), 2,000 hits', value: ms(render.median), note: `median of 10, ${cpu(render)}; used before rendering a WAV` },
    ],
  };
}
