import { describe, expect, it } from 'vitest';
import { cc14ToGainDb, cc7ToGainDb, ccStream, gainDbToCc14, gainDbToCc7, writeMidiCc } from './midi-write';

describe('MIDI CC mapping', () => {
  it('uses the GM2 / MIDI-CI default curve (REFERENCES.md "MIDI": 127→0, 100→−4.15, 96→−4.86, 64→−11.90, 32→−23.95, 16→−35.99, 1→−84.15 dB)', () => {
    const table: [number, number][] = [[127, 0], [100, -4.15], [96, -4.86], [64, -11.9], [32, -23.95], [16, -35.99], [1, -84.15]];
    for (const [v, db] of table) expect(cc7ToGainDb(v)).toBeCloseTo(db, 2);
    expect(cc7ToGainDb(0)).toBe(-Infinity);
    expect(gainDbToCc7(-6)).toBe(90);
    expect(gainDbToCc7(-12)).toBe(64);
    expect(gainDbToCc7(0)).toBe(127);
    expect(gainDbToCc7(-60, -60)).toBe(0); // the floor is written as silence
    for (let v = 1; v <= 127; v++) expect(gainDbToCc7(cc7ToGainDb(v))).toBe(v);
  });

  it('14-bit: 40·log10(v/16383), our choice (REFERENCES.md "14-bit controllers": 8192 → −12.04 dB)', () => {
    expect(cc14ToGainDb(8192)).toBeCloseTo(-12.04, 2);
    expect(gainDbToCc14(0)).toBe(16383);
    expect(gainDbToCc14(cc14ToGainDb(8192))).toBe(8192);
  });
});

describe('writeMidiCc', () => {
  const curve = { points: [{ timeSec: 0, gainDb: 0 }, { timeSec: 0.5, gainDb: 0 }, { timeSec: 0.505, gainDb: -40 }, { timeSec: 0.6, gainDb: -40 }, { timeSec: 0.7, gainDb: 0 }, { timeSec: 2, gainDb: 0 }], floorDb: -60 };

  it('writes MThd type 1, ntrks, division and a tempo track with FF 51 07 A1 20 at 120 BPM (SMF 1.0, REFERENCES.md)', () => {
    const bytes = writeMidiCc([{ name: 'Bass', curve }], { bpm: 120 });
    expect(Array.from(bytes.subarray(0, 14))).toEqual([0x4d, 0x54, 0x68, 0x64, 0, 0, 0, 6, 0, 1, 0, 2, 0x03, 0xc0]);
    const hex = Buffer.from(bytes).toString('hex');
    expect(hex).toContain('ff510307a120');
    expect(hex).toContain('ff580404021808');
    expect(hex.match(/00ff2f00/g)).toHaveLength(2);
    // 140 BPM → 428571 µs = 06 8A 1B.
    expect(Buffer.from(writeMidiCc([], { bpm: 140 })).toString('hex')).toContain('ff5103068a1b');
  });

  it('never repeats a value in the CC stream and ends at the curve\'s values', () => {
    const s = ccStream(curve, 120, 960);
    for (let i = 1; i < s.length; i++) {
      expect(s[i].value).not.toBe(s[i - 1].value);
      expect(s[i].tick).toBeGreaterThan(s[i - 1].tick);
    }
    expect(s[0]).toEqual({ tick: 0, value: 127 });
    expect(s.find((e) => e.tick === 1152)?.value ?? s.filter((e) => e.tick <= 1152).pop()!.value).toBe(gainDbToCc7(-40));
    expect(s[s.length - 1].value).toBe(127);
  });
});
