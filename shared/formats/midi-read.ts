import { parseMidi, type MidiData, type MidiEvent } from 'midi-file';
import type { Hit, MidiKickOptions } from '../schemas/hit';
import { withMidiKickDefaults } from '../schemas/hit-defaults';

/**
 * Kick hits from a Standard MIDI File (MMA RP-001, SMF 1.0; REFERENCES.md
 * "MIDI"), parsed with midi-file. Times honour the tempo map: set-tempo
 * meta events (FF 51 03, µs per quarter) from every track, 120 bpm
 * (500000 µs) until the first one. SMPTE division (bit 15 set) counts
 * ticks per frame at a fixed frame rate and ignores tempo.
 */

/** Why a MIDI file was refused; the server turns it into its HTTP error. */
export class MidiFormatError extends Error {
  constructor(
    public readonly code: string,
    public readonly status: 400 | 415 | 422,
    message: string,
  ) {
    super(message);
    this.name = 'MidiFormatError';
  }
}

export interface MidiKicks {
  hits: Hit[];
  /** Time of the last event of any track, seconds. */
  durationSec: number;
  format: 0 | 1 | 2;
  /** Ticks per quarter note, or null for SMPTE division. */
  ticksPerBeat: number | null;
}

/** One tempo segment: from `tick` on, a quarter lasts `usPerQuarter` µs; `sec` is the time at `tick`. */
interface TempoSegment {
  tick: number;
  sec: number;
  usPerQuarter: number;
}

const DEFAULT_US_PER_QUARTER = 500_000; // 120 bpm, SMF 1.0

const u32be = (b: Uint8Array, at: number): number => (((b[at] ?? 0) << 24) >>> 0) + ((b[at + 1] ?? 0) << 16) + ((b[at + 2] ?? 0) << 8) + (b[at + 3] ?? 0);
const ascii4 = (b: Uint8Array, at: number): string => String.fromCharCode(b[at] ?? 0, b[at + 1] ?? 0, b[at + 2] ?? 0, b[at + 3] ?? 0);

/**
 * Checks the chunk structure before midi-file parses it: midi-file reads
 * past a short chunk without complaint (its reads return undefined), so a
 * cut or corrupt track must be caught here.
 */
function checkChunks(bytes: Uint8Array): void {
  if (bytes.length < 14 || ascii4(bytes, 0) !== 'MThd') {
    throw new MidiFormatError('midi.not_midi', 415, bytes.length === 0 ? 'The MIDI file is empty (0 bytes).' : 'Not a Standard MIDI File (no MThd header).');
  }
  const headerLength = u32be(bytes, 4);
  if (headerLength < 6) throw new MidiFormatError('midi.bad_header', 400, `Corrupt MIDI file: MThd length ${headerLength} (6 expected).`);
  const tracks = ((bytes[10] ?? 0) << 8) | (bytes[11] ?? 0);
  let at = 8 + headerLength;
  for (let t = 0; t < tracks; t++) {
    if (at + 8 > bytes.length) throw new MidiFormatError('midi.broken_track', 400, `Broken MIDI file: track ${t + 1} of ${tracks} is missing (file ends at ${bytes.length} bytes).`);
    const id = ascii4(bytes, at);
    const length = u32be(bytes, at + 4);
    if (id !== 'MTrk') throw new MidiFormatError('midi.broken_track', 400, `Broken MIDI file: chunk '${id.replace(/[^\x20-\x7e]/g, '?')}' where track ${t + 1} should be.`);
    if (at + 8 + length > bytes.length) throw new MidiFormatError('midi.broken_track', 400, `Broken MIDI file: track ${t + 1} claims ${length} bytes, past the end of the file.`);
    at += 8 + length;
  }
}

/** Every value midi-file read must be a number; undefined means it read past the track. */
function checkEvent(e: MidiEvent, track: number): void {
  const values = Object.values(e);
  if (values.some((v) => v === undefined || (typeof v === 'number' && Number.isNaN(v)))) {
    throw new MidiFormatError('midi.broken_track', 400, `Broken MIDI file: track ${track + 1} ends in the middle of an event.`);
  }
}

function parse(bytes: Uint8Array): MidiData {
  checkChunks(bytes);
  let data: MidiData;
  try {
    data = parseMidi(bytes);
  } catch (e) {
    // midi-file throws strings ("Unrecognised MIDI event type byte: …").
    throw new MidiFormatError('midi.broken_track', 400, `Broken MIDI track: ${String(e instanceof Error ? e.message : e)}.`);
  }
  data.tracks.forEach((track, i) => track.forEach((e) => checkEvent(e, i)));
  return data;
}

/** Absolute ticks of each event of a track. */
function absoluteTicks(track: MidiEvent[]): number[] {
  const ticks: number[] = [];
  let tick = 0;
  for (const e of track) {
    tick += e.deltaTime;
    ticks.push(tick);
  }
  return ticks;
}

/** The tempo map of a type 0/1 file: segments sorted by tick, the first at tick 0. */
function tempoMap(data: MidiData): TempoSegment[] {
  const changes: Array<{ tick: number; us: number }> = [];
  for (const track of data.tracks) {
    const ticks = absoluteTicks(track);
    track.forEach((e, i) => {
      if (e.type === 'setTempo') changes.push({ tick: ticks[i]!, us: e.microsecondsPerBeat });
    });
  }
  // Stable sort: of two changes at one tick the later in the file wins.
  changes.sort((a, b) => a.tick - b.tick);
  const ppq = data.header.ticksPerBeat!;
  const map: TempoSegment[] = [{ tick: 0, sec: 0, usPerQuarter: DEFAULT_US_PER_QUARTER }];
  for (const c of changes) {
    const last = map[map.length - 1]!;
    const sec = last.sec + ((c.tick - last.tick) * last.usPerQuarter) / 1e6 / ppq;
    if (c.tick === last.tick) map[map.length - 1] = { tick: c.tick, sec: last.sec, usPerQuarter: c.us };
    else map.push({ tick: c.tick, sec, usPerQuarter: c.us });
  }
  return map;
}

/**
 * Converts ticks to seconds. PPQ: t = t_k + (tick − tick_k)·µs_k / 10⁶ / PPQ
 * over the tempo segment k holding the tick. SMPTE: t = tick / (fps · ticksPerFrame),
 * 29 meaning 29.97 drop-frame (SMF 1.0).
 */
export function tickClock(data: MidiData): (tick: number) => number {
  const h = data.header;
  if (h.ticksPerBeat === undefined) {
    const fps = h.framesPerSecond === 29 ? 30000 / 1001 : h.framesPerSecond ?? 30;
    const perSec = fps * (h.ticksPerFrame ?? 1);
    return (tick) => tick / perSec;
  }
  if (!h.ticksPerBeat) throw new MidiFormatError('midi.bad_header', 400, 'Corrupt MIDI file: division of 0 ticks per quarter note.');
  const map = tempoMap(data);
  const ppq = h.ticksPerBeat;
  return (tick) => {
    let lo = 0;
    let hi = map.length - 1;
    while (lo < hi) {
      const mid = (lo + hi + 1) >> 1;
      if (map[mid]!.tick <= tick) lo = mid;
      else hi = mid - 1;
    }
    const seg = map[lo]!;
    return seg.sec + ((tick - seg.tick) * seg.usPerQuarter) / 1e6 / ppq;
  };
}

/**
 * Reads the kick notes of an SMF: note-ons (velocity > 0; velocity 0 is a
 * note-off, SMF 1.0) of `notes` on `channel` (1-based; null = any).
 * strength = velocity / 127. Notes at the same instant (within 1 ms, e.g.
 * 35 and 36 layered) are one hit with the larger velocity.
 * Errors (MidiFormatError): midi.not_midi 415, midi.bad_header 400,
 * midi.broken_track 400, midi.unsupported_format 415 (type 2), midi.no_kicks 422.
 */
export function readMidiKicks(bytes: Uint8Array, options: Partial<MidiKickOptions> = {}): MidiKicks {
  const opts = withMidiKickDefaults(options);
  const data = parse(bytes);
  if (data.header.format === 2) {
    throw new MidiFormatError('midi.unsupported_format', 415, 'MIDI type 2 (independent sequences) is not supported; export the kick as type 0 or 1.');
  }
  const clock = tickClock(data);
  const notes = new Set(opts.notes);
  const channel = opts.channel === null ? null : opts.channel - 1;
  const found: Array<{ timeSec: number; velocity: number }> = [];
  let lastTick = 0;
  for (const track of data.tracks) {
    const ticks = absoluteTicks(track);
    lastTick = Math.max(lastTick, ticks[ticks.length - 1] ?? 0);
    track.forEach((e, i) => {
      if (e.type !== 'noteOn' || e.velocity === 0 || !notes.has(e.noteNumber)) return;
      if (channel !== null && e.channel !== channel) return;
      found.push({ timeSec: clock(ticks[i]!), velocity: e.velocity });
    });
  }
  if (found.length === 0) {
    const where = channel === null ? 'any channel' : `channel ${channel + 1}`;
    throw new MidiFormatError('midi.no_kicks', 422, `No kick notes (${opts.notes.join(', ')}) on ${where} in the MIDI file.`);
  }
  found.sort((a, b) => a.timeSec - b.timeSec);
  const hits: Hit[] = [];
  let lastVelocity = 0;
  for (const n of found) {
    const last = hits[hits.length - 1];
    if (last && n.timeSec - last.timeSec < 0.001) {
      if (n.velocity > lastVelocity) {
        last.strength = n.velocity / 127;
        lastVelocity = n.velocity;
      }
      continue;
    }
    hits.push({ timeSec: n.timeSec, strength: n.velocity / 127, enabled: true });
    lastVelocity = n.velocity;
  }
  return {
    hits,
    durationSec: clock(lastTick),
    format: data.header.format,
    ticksPerBeat: data.header.ticksPerBeat ?? null,
  };
}
