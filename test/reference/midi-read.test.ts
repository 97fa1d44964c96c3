import { describe, expect, it } from 'vitest';
import { execFileSync } from 'node:child_process';
import { mkdirSync, writeFileSync } from 'node:fs';
import { join } from 'node:path';
import ToneMidi from '@tonejs/midi';
import { readMidiKicks, MidiFormatError } from '../../shared/formats/midi-read';
import { detectKickFile } from '../../server/audio/kick-detection';
import { AudioInputError } from '../../server/audio/audio-errors';
import { FIXTURE_DIR } from './fixtures/kick-scene';
import { drumNotes, kickMidiNoTempo, kickMidiSmpte, kickMidiType0, kickMidiType1, tickToSec } from './fixtures/midi-kick-file';

const dir = join(FIXTURE_DIR, 'midi');
mkdirSync(dir, { recursive: true });
const write = (name: string, bytes: Uint8Array): string => {
  const path = join(dir, name);
  writeFileSync(path, bytes);
  return path;
};

/** Kicks by construction: GM 35/36 on channel 10 (REFERENCES.md, GM1 percussion map). */
const expectedKicks = drumNotes()
  .filter((n) => n.channel === 9 && (n.note === 35 || n.note === 36))
  .sort((a, b) => a.tick - b.tick);

/** Kick onsets as Debian's python3-mido reads them (REFERENCES/TOOLCHAIN: mido reads SMF exactly). */
function midoKickTimes(path: string): number[] {
  const script = [
    'import sys, mido',
    't = 0.0',
    'for m in mido.MidiFile(sys.argv[1]):',
    '    t += m.time',
    "    if m.type == 'note_on' and m.velocity > 0 and m.channel == 9 and m.note in (35, 36): print(repr(t))",
  ].join('\n');
  return execFileSync('/usr/bin/python3', ['-c', script, path], { encoding: 'utf8' }).trim().split('\n').map(Number);
}

describe('MIDI kicks: tempo map, division, notes and channel', () => {
  it('type 1 with tempo changes: times by construction, cross-checked with @tonejs/midi and mido', () => {
    const bytes = kickMidiType1();
    const path = write('kick-type1.mid', bytes);
    const { hits, format, ticksPerBeat, durationSec } = readMidiKicks(bytes);
    expect(format).toBe(1);
    expect(ticksPerBeat).toBe(480);
    expect(hits).toHaveLength(expectedKicks.length);
    hits.forEach((h, i) => {
      // Known by construction: the piecewise tempo map (120 → 140 → 90 bpm).
      expect(h.timeSec).toBeCloseTo(tickToSec(expectedKicks[i]!.tick), 9);
      // strength = velocity / 127 (our contract); the ghost at 20 stays, weak.
      expect(h.strength).toBeCloseTo(expectedKicks[i]!.velocity / 127, 9);
      expect(h.enabled).toBe(true);
      expect(h.sample).toBeUndefined();
    });
    expect(durationSec).toBeCloseTo(tickToSec(6 * 4 * 480), 9);
    // Independent parser 1: @tonejs/midi (drops the note-less tempo track, keeps times).
    const tone = new ToneMidi.Midi(bytes);
    const toneKicks = tone.tracks
      .flatMap((t) => t.notes.map((n) => ({ time: n.time, midi: n.midi, channel: t.channel })))
      .filter((n) => n.channel === 9 && (n.midi === 35 || n.midi === 36))
      .sort((a, b) => a.time - b.time);
    expect(toneKicks.map((n) => n.time)).toHaveLength(hits.length);
    toneKicks.forEach((n, i) => expect(hits[i]!.timeSec).toBeCloseTo(n.time, 6));
    // Independent parser 2: python3-mido.
    const mido = midoKickTimes(path);
    expect(mido).toHaveLength(hits.length);
    mido.forEach((t, i) => expect(hits[i]!.timeSec).toBeCloseTo(t, 6));
  });

  it('type 0 gives the same hits as type 1', () => {
    const a = readMidiKicks(kickMidiType1()).hits;
    const b = readMidiKicks(kickMidiType0());
    expect(b.format).toBe(0);
    expect(b.hits).toEqual(a);
  });

  it('no tempo event means 120 bpm (SMF 1.0; REFERENCES.md "MIDI")', () => {
    const { hits } = readMidiKicks(kickMidiNoTempo());
    expect(hits.map((h) => h.timeSec)).toEqual([0, 0.5, 200 / 96 / 2, 2].map((t) => expect.closeTo(t, 9)));
  });

  it('SMPTE division: 25 fps × 40 ticks = 1 ms per tick, tempo events ignored (SMF 1.0)', () => {
    const path = write('kick-smpte.mid', kickMidiSmpte());
    const { hits, ticksPerBeat } = readMidiKicks(kickMidiSmpte());
    expect(ticksPerBeat).toBeNull();
    expect(hits.map((h) => h.timeSec)).toEqual([0, 0.25, 1, 1.75].map((t) => expect.closeTo(t, 9)));
    const mido = midoKickTimes(path);
    // mido applies tempo to SMPTE files; we follow the spec. Noted, not compared.
    expect(mido).toHaveLength(4);
  });

  it('configurable notes and channel; null channel means any', () => {
    const bytes = kickMidiType1();
    expect(readMidiKicks(bytes, { notes: [38] }).hits).toHaveLength(12);
    const any = readMidiKicks(bytes, { notes: [36], channel: null }).hits;
    expect(any).toHaveLength(expectedKicks.filter((k) => k.note === 36).length + 1);
    const ch1 = readMidiKicks(bytes, { notes: [36], channel: 1 }).hits;
    expect(ch1).toHaveLength(1);
    expect(ch1[0]!.timeSec).toBeCloseTo(tickToSec(2 * 480 + 240), 9);
  });

  it('detectKickFile sniffs MThd and returns a midi DetectionResult', async () => {
    const result = await detectKickFile(write('sniff.mid', kickMidiType1()));
    expect(result.source).toBe('midi');
    expect(result.sampleRate).toBeNull();
    expect(result.hits).toHaveLength(expectedKicks.length);
  });
});

describe('MIDI: bad input gives one clear error', () => {
  const codeOf = (run: () => unknown): { code: string; status: number } | null => {
    try {
      run();
      return null;
    } catch (e) {
      expect(e).toBeInstanceOf(MidiFormatError);
      expect((e as Error).message).not.toMatch(/\n/);
      return { code: (e as MidiFormatError).code, status: (e as MidiFormatError).status };
    }
  };
  it('not a MIDI file → midi.not_midi, 415', () => {
    expect(codeOf(() => readMidiKicks(new TextEncoder().encode('RIFF....WAVEfmt ')))).toEqual({ code: 'midi.not_midi', status: 415 });
  });
  it('a track cut in the middle of an event → midi.broken_track, 400', () => {
    const b = kickMidiType1();
    // Keep the chunk lengths consistent with the cut so only the event is broken.
    const cut = b.slice(0, b.length - 7);
    const view = new DataView(cut.buffer);
    // Second MTrk: find it and shorten its length field by 7.
    let at = 14;
    at += 8 + view.getUint32(at + 4);
    view.setUint32(at + 4, view.getUint32(at + 4) - 7);
    expect(codeOf(() => readMidiKicks(cut))).toEqual({ code: 'midi.broken_track', status: 400 });
  });
  it('a track length past the end of the file → midi.broken_track, 400', () => {
    const b = kickMidiType1();
    expect(codeOf(() => readMidiKicks(b.slice(0, b.length - 20)))).toEqual({ code: 'midi.broken_track', status: 400 });
  });
  it('a status byte midi-file does not know → midi.broken_track, 400', () => {
    const b = kickMidiType1();
    // The first event of the drum track: replace its status (0x99) with 0xF4, undefined in SMF.
    let at = 14;
    at += 8 + new DataView(b.buffer).getUint32(at + 4);
    expect(b[at + 9]).toBe(0x99);
    b[at + 9] = 0xf4;
    expect(codeOf(() => readMidiKicks(b))).toEqual({ code: 'midi.broken_track', status: 400 });
  });
  it('no kick notes → midi.no_kicks, 422 (through detectKickFile: AudioInputError)', async () => {
    const error = await detectKickFile(write('no-kicks.mid', kickMidiType1()), { midi: { notes: [49] } }).catch((e: unknown) => e);
    expect(error).toBeInstanceOf(AudioInputError);
    expect({ code: (error as AudioInputError).code, status: (error as AudioInputError).status }).toEqual({ code: 'midi.no_kicks', status: 422 });
  });
});
