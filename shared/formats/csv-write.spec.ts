import { describe, expect, it } from 'vitest';
import { CSV_COLUMNS, writeBreakpointCsv } from './csv-write';

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
