import { describe, expect, it } from 'vitest';
import { parseMidi } from 'midi-file';
import type { GainCurve, GainPoint } from '../dsp/gain-curve';
import { gainDbAt } from '../dsp/gain';
import { cc14ToGainDb, cc7ToGainDb, ccStream, gainDbToCc14, gainDbToCc7, writeMidiCc } from './midi-write';
import { mulberry32 as rng } from '../dsp/prng';

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

describe('writeMidiCc against a reference sampling', () => {
  it('holds round(F·10^(G/40)) of the curve at every tick, 0 at the floor, read back by midi-file (property: random curves, tempos, PPQs, 7 and 14 bits)', () => {
    const r = rng(5);
    let ticksChecked = 0;
    let ambiguous = 0;
    const mismatches: string[] = [];
    for (let k = 0; k < 40; k++) {
      const floorDb = -60 - Math.floor(r() * 3) * 10;
      const points: GainPoint[] = [];
      let t = 0;
      let g = 0;
      const n = 2 + Math.floor(r() * 120);
      for (let i = 0; i < n; i++) {
        points.push({ timeSec: t, gainDb: g });
        // Segments shorter than a tick, flat holds, holds at the floor, long fades.
        t += r() < 0.4 ? r() * 0.0008 : r() * (r() < 0.1 ? 2 : 0.08);
        g = r() < 0.25 ? g : r() < 0.15 ? floorDb : Math.max(floorDb, 6 - r() * 70);
      }
      const curve: GainCurve = { points, floorDb };
      const bpm = 40 + r() * 200;
      const ppq = [960, 480, 96, 1920][Math.floor(r() * 4)];
      const fourteenBit = r() < 0.5;
      const fullScale = fourteenBit ? 16383 : 127;
      const cc = 1 + Math.floor(r() * 31);
      const file = parseMidi(writeMidiCc([{ name: 'Bass', curve }], { bpm, ppq, cc, fourteenBit }));
      expect(file.header.ticksPerBeat).toBe(ppq);
      // The value the lane holds at each tick, from the events as an independent parser reads them.
      const held = new Map<number, number>();
      let tick = 0;
      let msb = 0;
      for (const e of file.tracks[1]) {
        tick += e.deltaTime;
        if (e.type !== 'controller') continue;
        if (!fourteenBit) held.set(tick, e.value);
        else if (e.controllerType === cc) msb = e.value;
        else held.set(tick, msb * 128 + e.value);
      }
      const ticksPerSec = (bpm * ppq) / 60;
      const lastTick = Math.floor(points[points.length - 1].timeSec * ticksPerSec);
      let value = -1;
      for (let q = 0; q <= lastTick; q++) {
        value = held.get(q) ?? value;
        const gain = gainDbAt(curve, q / ticksPerSec);
        const scaled = fullScale * Math.pow(10, gain / 40);
        // Where rounding errors of either computation could decide, either answer is right.
        if (Math.abs(scaled - Math.floor(scaled) - 0.5) < 1e-6 || (gain !== floorDb && Math.abs(gain - floorDb) < 1e-6)) {
          ambiguous++;
          continue;
        }
        const want = gain <= floorDb ? 0 : Math.min(fullScale, Math.round(scaled));
        if (value !== want) mismatches.push(`curve ${k}, tick ${q}: ${value}, not ${want}`);
        ticksChecked++;
      }
    }
    expect(mismatches.slice(0, 5)).toEqual([]);
    expect(ticksChecked).toBeGreaterThan(100_000);
    expect(ambiguous).toBeLessThan(ticksChecked / 100);
  });

  it('writes the same bytes whatever it wrote before (the lane stream\'s arrays are reused from call to call)', () => {
    const ramp = (seconds: number): GainCurve => ({ points: [{ timeSec: 0, gainDb: 0 }, { timeSec: seconds / 2, gainDb: -50 }, { timeSec: seconds, gainDb: 0 }], floorDb: -60 });
    const first = writeMidiCc([{ name: 'Bass', curve: ramp(1) }], { bpm: 120 });
    writeMidiCc([{ name: 'Long', curve: ramp(600) }, { name: 'Short', curve: ramp(0.5) }], { bpm: 200, fourteenBit: true });
    expect(writeMidiCc([{ name: 'Bass', curve: ramp(1) }], { bpm: 120 })).toEqual(first);
    expect(first.length).toBeGreaterThan(100);
  });
});
