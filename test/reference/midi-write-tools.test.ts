/**
 * Requirement 5: every MIDI file we write is read back by two independent
 * parsers, @tonejs/midi and Python's mido (/usr/bin/python3, Debian
 * python3-mido), checking format, division, tempo (FF 51), time signature
 * (FF 58), track names, controller numbers, channels, ticks and values.
 * Expected values come from the curve through round(127·10^(dB/40))
 * (REFERENCES.md "MIDI", GM2 / MIDI-CI default mapping) and
 * tick = round(s · bpm/60 · ppq), computed here independently of the writer.
 */
import { execFileSync } from 'node:child_process';
import { mkdtempSync, readFileSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import ToneMidi from '@tonejs/midi';
import { describe, expect, it } from 'vitest';
import { exportMidi, stampForLane } from '../../server/engine/engine.service';
import { gainDbAt } from '../../shared/dsp/gain';
import type { Hit } from '../../shared/schemas/hit';

const PY = '/usr/bin/python3';
const MIDO_DUMP = `
import json, sys
try:
    import mido
except ImportError:
    print("MIDO_MISSING"); sys.exit(3)
f = mido.MidiFile(sys.argv[1])
out = {"type": f.type, "ticks_per_beat": f.ticks_per_beat, "tracks": []}
for tr in f.tracks:
    t = 0; evs = []
    for m in tr:
        t += m.time
        d = m.dict(); d["abs"] = t; d["is_meta"] = m.is_meta
        evs.append(d)
    out["tracks"].append(evs)
print(json.dumps(out))
`;

interface MidoEvent { type: string; abs: number; [k: string]: unknown }
function mido(path: string): { type: number; ticks_per_beat: number; tracks: MidoEvent[][] } {
  let text: string;
  try {
    text = execFileSync(PY, ['-c', MIDO_DUMP, path], { encoding: 'utf8' });
  } catch (e) {
    const out = String((e as { stdout?: string }).stdout ?? '');
    if (out.includes('MIDO_MISSING')) throw new Error('Python mido is missing: apt-get install python3-mido');
    throw new Error(`${PY} could not run (${(e as Error).message.split('\n')[0]}); install python3 and python3-mido (apt-get install python3-mido)`);
  }
  return JSON.parse(text);
}

const hits: Hit[] = [0.5, 1.0, 1.25, 2.0].map((timeSec, i) => ({ timeSec, strength: 0.5 + i * 0.1, enabled: true }));
const shape = { points: [{ tMs: -3, gainDb: 0 }, { tMs: 0, gainDb: -40 }, { tMs: 50, gainDb: -40 }, { tMs: 150, gainDb: 0 }], slopeGuardMs: 5 };
const { curve } = stampForLane(hits, { name: '808', shape, baseGainDb: -2 }, { durationSec: 3 });
const dir = mkdtempSync(join(tmpdir(), 'tuckline-midi-'));

function write(name: string, opts: Parameters<typeof exportMidi>[1], withHits = false): string {
  const path = join(dir, name);
  writeFileSync(path, exportMidi([{ name: '808', curve }, { name: 'Synth bass', curve }], opts, withHits ? hits : []));
  return path;
}

/** Seconds of a tick at a constant tempo. */
const secOf = (tick: number, bpm: number, ppq: number) => (tick * 60) / (bpm * ppq);

describe('MIDI CC file read back by @tonejs/midi and mido', () => {
  it('7-bit CC 11, channel 1, 960 PPQ, 120 BPM: header, tempo, time signature, names, ticks and values', () => {
    const path = write('cc7.mid', {});
    const m = mido(path);
    expect(m.type).toBe(1);
    expect(m.ticks_per_beat).toBe(960);
    expect(m.tracks).toHaveLength(3);
    const meta = m.tracks[0];
    expect(meta.find((e) => e.type === 'set_tempo')).toMatchObject({ tempo: 500000, abs: 0 });
    expect(meta.find((e) => e.type === 'time_signature')).toMatchObject({ numerator: 4, denominator: 4, abs: 0 });
    expect(meta.find((e) => e.type === 'track_name')).toBeTruthy();
    for (const [i, name] of [[1, '808'], [2, 'Synth bass']] as const) {
      const tr = m.tracks[i];
      expect(tr.find((e) => e.type === 'track_name')?.name).toBe(name);
      expect(tr[tr.length - 1].type).toBe('end_of_track');
      const ccs = tr.filter((e) => e.type === 'control_change');
      expect(ccs.length).toBeGreaterThan(20);
      let prev = -1;
      for (const e of ccs) {
        expect(e.control).toBe(11);
        expect(e.channel).toBe(0); // mido counts channels from 0: channel 1
        expect(e.value).not.toBe(prev); // thinned: no repeated values
        prev = e.value as number;
        // The value is the GM2 mapping of the curve at that tick.
        const expected = Math.round(127 * Math.pow(10, gainDbAt(curve, secOf(e.abs, 120, 960)) / 40));
        expect(e.value).toBe(expected);
      }
      // At the bottom of each tuck: −42 dB → round(127·10^(−42/40)) = 11, at its hit's tick.
      for (const h of hits) {
        const tick = Math.round(h.timeSec * 2 * 960);
        const v = ccs.filter((e) => e.abs <= tick + 1).pop()!.value;
        expect(v).toBe(Math.round(127 * Math.pow(10, -42 / 40)));
      }
      // Outside tucks: base gain −2 dB → 113.
      expect(ccs[0]).toMatchObject({ abs: 0, value: Math.round(127 * Math.pow(10, -2 / 40)) });
    }

    const tone = new ToneMidi.Midi(readFileSync(path));
    expect(tone.header.ppq).toBe(960);
    expect(tone.header.tempos[0].bpm).toBeCloseTo(120, 6);
    expect(tone.header.timeSignatures[0].timeSignature).toEqual([4, 4]);
    const lane = tone.tracks.find((t) => t.name === '808')!;
    expect(lane.channel).toBe(0);
    const toneCcs = lane.controlChanges[11];
    const midoCcs = m.tracks[1].filter((e) => e.type === 'control_change');
    expect(toneCcs.map((c) => [c.ticks, Math.round(c.value * 127)])).toEqual(midoCcs.map((e) => [e.abs, e.value]));
  });

  it('options: CC 7, channel 3, 480 PPQ, 140 BPM, 3/4, marker track with a note at each hit', () => {
    const path = write('opts.mid', { cc: 7, channel: 3, ppq: 480, bpm: 140, timeSignature: [3, 4], markerTrack: true }, true);
    const m = mido(path);
    expect(m.ticks_per_beat).toBe(480);
    expect(m.tracks).toHaveLength(4);
    expect(m.tracks[0].find((e) => e.type === 'set_tempo')?.tempo).toBe(428571);
    expect(m.tracks[0].find((e) => e.type === 'time_signature')).toMatchObject({ numerator: 3, denominator: 4 });
    const ccs = m.tracks[1].filter((e) => e.type === 'control_change');
    expect(new Set(ccs.map((e) => `${e.control}/${e.channel}`))).toEqual(new Set(['7/2']));
    const notes = m.tracks[3].filter((e) => e.type === 'note_on');
    expect(notes.map((e) => e.abs)).toEqual(hits.map((h) => Math.round((h.timeSec * 140 * 480) / 60)));
    expect(notes.every((e) => e.note === 36 && e.channel === 9)).toBe(true);
    const tone = new ToneMidi.Midi(readFileSync(path));
    expect(tone.header.tempos[0].bpm).toBeCloseTo(140, 3);
    const markers = tone.tracks.find((t) => t.name === 'Kick hits')!;
    expect(markers.notes.map((n) => n.ticks)).toEqual(notes.map((e) => e.abs));
    expect(markers.notes.map((n) => n.velocity * 127).map(Math.round)).toEqual(hits.map((h) => Math.round(h.strength * 127)));
  });

  it('14-bit: MSB on CC 11, LSB on CC 43, value14 = MSB·128 + LSB ≈ round(16383·10^(dB/40)) (our curve; REFERENCES.md "14-bit controllers")', () => {
    const m = mido(write('cc14.mid', { fourteenBit: true }));
    const evs = m.tracks[1].filter((e) => e.type === 'control_change');
    expect(new Set(evs.map((e) => e.control))).toEqual(new Set([11, 43]));
    let msb = -1;
    let checked = 0;
    for (const e of evs) {
      if (e.control === 11) {
        msb = e.value as number;
        continue;
      }
      expect(msb).toBeGreaterThanOrEqual(0); // an LSB never comes before its first MSB
      const v14 = msb * 128 + (e.value as number);
      const expected = Math.round(16383 * Math.pow(10, gainDbAt(curve, secOf(e.abs, 120, 960)) / 40));
      expect(v14).toBe(expected);
      checked++;
    }
    expect(checked).toBeGreaterThan(50);
  });
});
