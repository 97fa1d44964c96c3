import { describe, expect, it } from 'vitest';
import type { GainCurve, GainPoint } from '../dsp/gain-curve';
import { formatBarBeatTick, secondsToBarBeatTick } from './bar-beat';
import { CSV_COLUMNS, writeBreakpointCsv } from './csv-write';
import { mulberry32 as rng } from '../dsp/prng';

describe('writeBreakpointCsv', () => {
  const curve = { points: [{ timeSec: 0, gainDb: 0 }, { timeSec: 4.75, gainDb: -6.0206 }, { timeSec: 4.7500001, gainDb: -7 }, { timeSec: 5, gainDb: -40 }] };

  it('writes the header, CRLF line ends and the columns in order (RFC 4180 §2)', () => {
    const csv = writeBreakpointCsv(curve, { sampleRate: 48000, bpm: 120 });
    expect(csv.startsWith(`${CSV_COLUMNS.join(',')}\r\n`)).toBe(true);
    expect(CSV_COLUMNS.slice(0, 2)).toEqual(['time_s', 'gain_db']);
    expect(csv.endsWith('\r\n')).toBe(true);
    expect(csv.replace(/\r\n/g, '')).not.toMatch(/[\r\n]/);
    const rows = csv.trimEnd().split('\r\n').slice(1);
    expect(rows[1]).toBe('4.750000,-6.021,228000,3.2.480,0.500000');
    // The row 0.1 µs later rounds to the same time and is dropped.
    expect(rows).toHaveLength(3);
    expect(rows[2]).toBe('5.000000,-40.000,240000,3.3.0,0.010000');
  });
});

/** An integer count of 10^−d as a decimal, by string slicing (no shared code with the writer). */
function fixed(scaled: number, d: number): string {
  const digits = String(Math.abs(scaled)).padStart(d + 1, '0');
  return `${scaled < 0 ? '-' : ''}${digits.slice(0, -d)}.${digits.slice(-d)}`;
}

/** The CSV as the writer's documentation states it, one row at a time with strings, Math.pow and bar-beat.ts. */
function referenceCsv(curve: GainCurve, sampleRate: number, bpm: number, timeSignature: [number, number], ppq: number): string {
  const rows = [CSV_COLUMNS.join(',')];
  let last = -1;
  for (const p of curve.points) {
    const t = Math.max(0, p.timeSec);
    const micros = Math.round(t * 1e6);
    if (micros === last) continue;
    last = micros;
    const bbt = formatBarBeatTick(secondsToBarBeatTick(t, bpm, timeSignature, ppq));
    rows.push([fixed(micros, 6), fixed(Math.round(p.gainDb * 1000), 3), String(Math.round(t * sampleRate)), bbt, fixed(Math.round(Math.pow(10, p.gainDb / 20) * 1e6), 6)].join(','));
  }
  return rows.map((r) => `${r}\r\n`).join('');
}

describe('writeBreakpointCsv against a reference encoding', () => {
  it('is byte for byte the row-by-row string encoding on random curves, tempos, meters and PPQs (property; bar.beat.tick from bar-beat.ts)', () => {
    const r = rng(11);
    const meters: [number, 1 | 2 | 4 | 8 | 16 | 32][] = [[4, 4], [3, 4], [6, 8], [7, 8], [5, 16], [3, 32], [2, 2]];
    let rows = 0;
    for (let k = 0; k < 120; k++) {
      const points: GainPoint[] = [];
      let t = -r() * 0.01;
      const n = 2 + Math.floor(r() * 400);
      let g = -r() * 10;
      for (let i = 0; i < n; i++) {
        points.push({ timeSec: t, gainDb: g });
        // Steps as small as a tenth of a microsecond (dropped rows), flat runs, gains above unity and at the floor.
        t += r() < 0.1 ? 1e-7 : r() * (r() < 0.05 ? 30 : 0.05);
        g = r() < 0.3 ? g : r() < 0.1 ? -60 : 12 - r() * 80;
      }
      const sampleRate = [44100, 48000, 96000, 22050][Math.floor(r() * 4)];
      const bpm = 20 + r() * 380;
      const timeSignature = meters[Math.floor(r() * meters.length)];
      const ppq = [960, 480, 96, 100, 24, 1001][Math.floor(r() * 6)];
      const csv = writeBreakpointCsv({ points }, { sampleRate, bpm, timeSignature, ppq });
      expect(csv).toBe(referenceCsv({ points }, sampleRate, bpm, timeSignature, ppq));
      rows += csv.split('\r\n').length;
    }
    expect(rows).toBeGreaterThan(10_000);
  });
});
