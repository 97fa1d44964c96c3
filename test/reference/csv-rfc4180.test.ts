/**
 * Requirement 4: the breakpoint CSV parsed back with a small RFC 4180 reader
 * written here (independent of the writer): records end in CRLF, fields are
 * plain or double-quoted, every record has the header's field count; values
 * round-trip to the stamped, thinned curve.
 */
import { describe, expect, it } from 'vitest';
import { exportCsv, stampForLane } from '../../server/engine/engine.service';
import { thinCurve } from '../../shared/dsp/curve-thin';
import type { Hit } from '../../shared/schemas/hit';

/** RFC 4180 §2 grammar: file = [header CRLF] record *(CRLF record) [CRLF]. Throws on anything else. */
function parseRfc4180(text: string): string[][] {
  const records: string[][] = [];
  let i = 0;
  while (i < text.length) {
    const record: string[] = [];
    for (;;) {
      let field = '';
      if (text[i] === '"') {
        i++;
        for (;;) {
          if (i >= text.length) throw new Error('unterminated quoted field');
          if (text[i] === '"') {
            if (text[i + 1] === '"') {
              field += '"';
              i += 2;
              continue;
            }
            i++;
            break;
          }
          field += text[i++];
        }
      } else {
        while (i < text.length && text[i] !== ',' && text[i] !== '\r' && text[i] !== '\n') {
          if (text[i] === '"') throw new Error(`quote inside a plain field at ${i}`);
          field += text[i++];
        }
      }
      record.push(field);
      if (text[i] === ',') {
        i++;
        continue;
      }
      break;
    }
    if (i < text.length) {
      if (text[i] !== '\r' || text[i + 1] !== '\n') throw new Error(`line end at ${i} is not CRLF`);
      i += 2;
    }
    records.push(record);
  }
  const width = records[0]?.length;
  for (const r of records) if (r.length !== width) throw new Error('records differ in field count');
  return records;
}

describe('breakpoint CSV, RFC 4180', () => {
  const hits: Hit[] = [0.5, 1.0, 4.75, 4.9].map((timeSec) => ({ timeSec, strength: 1, enabled: true }));
  const shape = { points: [{ tMs: -3, gainDb: 0 }, { tMs: 0, gainDb: -40 }, { tMs: 50, gainDb: -40 }, { tMs: 150, gainDb: 0 }], slopeGuardMs: 5 };
  const { curve } = stampForLane(hits, { shape, baseGainDb: -1.5 }, { durationSec: 6 });
  const csv = new TextDecoder().decode(exportCsv(curve, { sampleRate: 44100, bpm: 120, timeSignature: [4, 4], ppq: 960 }));
  const rows = parseRfc4180(csv);

  it('has the header time_s,gain_db,sample,bar_beat_tick,gain_linear, CRLF ends and no comment lines', () => {
    expect(rows[0]).toEqual(['time_s', 'gain_db', 'sample', 'bar_beat_tick', 'gain_linear']);
    expect(csv.split('\r\n').every((line) => !line.startsWith('#'))).toBe(true);
    expect(csv).not.toMatch(/[^\r]\n/);
  });

  it('round-trips the thinned curve: ascending times, dB, samples, bar.beat.tick and linear gain', () => {
    const thin = thinCurve(curve).points;
    const data = rows.slice(1);
    expect(data.length).toBe(thin.length);
    let prev = -1;
    data.forEach(([t, db, sample, bbt, lin], k) => {
      for (const v of [t, db, lin]) expect(v).toMatch(/^-?\d+\.\d+$/); // '.' decimal, no exponent
      const time = Number(t);
      expect(time).toBeGreaterThan(prev);
      prev = time;
      expect(Math.abs(time - thin[k].timeSec)).toBeLessThanOrEqual(5e-7);
      expect(Math.abs(Number(db) - thin[k].gainDb)).toBeLessThanOrEqual(5e-4);
      expect(Number(sample)).toBe(Math.round(thin[k].timeSec * 44100));
      // bar.beat.tick recomputed here: 120 BPM 4/4 → a beat is 0.5 s, 960 ticks.
      const ticks = Math.round(thin[k].timeSec * 1920);
      expect(bbt).toBe(`${Math.floor(ticks / 3840) + 1}.${Math.floor((ticks % 3840) / 960) + 1}.${ticks % 960}`);
      expect(Math.abs(Number(lin) - Math.pow(10, thin[k].gainDb / 20))).toBeLessThanOrEqual(5e-7);
    });
    expect(data.some((r) => r[3] === '3.2.480')).toBe(true); // the hit at 4.75 s
    expect(Number(data[0][1])).toBe(-1.5);
  });
});
