import type { GainCurve } from '../dsp/gain-curve';
import { midiExportOptionsSchema, type MidiExportOptionsInput } from '../schemas/export-options';
import { secondsToTicks } from './bar-beat';
import { encodeVlq, writeVlq } from './vlq';

/**
 * Gain → 7-bit controller value: v = round(127 · 10^(G/40)), 0 at or below the
 * floor. Source: MIDI-CI Profile "Default Control Change Mapping" v1.0
 * (AMEI/MMA M2-113-UM), Appendix B, and General MIDI 2 (gain_dB = 40·log10(v/127));
 * REFERENCES.md "MIDI": 0 dB → 127, −6 dB → 90, −12 dB → 64.
 */
export function gainDbToCc7(gainDb: number, floorDb = -Infinity): number {
  if (gainDb <= floorDb) return 0;
  return Math.max(0, Math.min(127, Math.round(127 * Math.pow(10, gainDb / 40))));
}

/** 7-bit value → gain dB: 40·log10(v/127); 0 → −Infinity (silence). Same source as `gainDbToCc7`. */
export function cc7ToGainDb(value: number): number {
  return value > 0 ? 40 * Math.log10(value / 127) : -Infinity;
}

/**
 * Gain → 14-bit value v14 = round(16383 · 10^(G/40)), 0 at or below the floor.
 * No source defines a 14-bit gain curve: this extension of the GM2 curve to
 * 16383 is our choice (REFERENCES.md "14-bit controllers"; 8192 → −12.04 dB).
 */
export function gainDbToCc14(gainDb: number, floorDb = -Infinity): number {
  if (gainDb <= floorDb) return 0;
  return Math.max(0, Math.min(16383, Math.round(16383 * Math.pow(10, gainDb / 40))));
}

/** 14-bit value → gain dB: 40·log10(v14/16383) (our choice, see `gainDbToCc14`). */
export function cc14ToGainDb(value: number): number {
  return value > 0 ? 40 * Math.log10(value / 16383) : -Infinity;
}

/**
 * One event of a track at an absolute tick; `rank` orders events within a
 * tick. Channel messages keep their up to three bytes in fields (a song has
 * hundreds of thousands of them), meta events their bytes in `bytes`.
 */
interface TrackEvent {
  tick: number;
  rank: number;
  n: number;
  b0: number;
  b1: number;
  b2: number;
  bytes?: number[];
}

function meta(rank: number, bytes: number[]): TrackEvent {
  return { tick: 0, rank, n: bytes.length, b0: 0, b1: 0, b2: 0, bytes };
}

function channelMessage(tick: number, rank: number, b0: number, b1: number, b2: number): TrackEvent {
  return { tick, rank, n: 3, b0, b1, b2 };
}

// One small encoder per event kind (Standard MIDI File 1.0, MMA RP-001).
function utf8(text: string): number[] {
  const out: number[] = [];
  for (const ch of text) {
    const c = ch.codePointAt(0)!;
    if (c < 0x80) out.push(c);
    else if (c < 0x800) out.push(0xc0 | (c >> 6), 0x80 | (c & 63));
    else if (c < 0x10000) out.push(0xe0 | (c >> 12), 0x80 | ((c >> 6) & 63), 0x80 | (c & 63));
    else out.push(0xf0 | (c >> 18), 0x80 | ((c >> 12) & 63), 0x80 | ((c >> 6) & 63), 0x80 | (c & 63));
  }
  return out;
}
/** FF 03 len text: sequence/track name. */
function trackName(name: string): TrackEvent {
  const text = utf8(name);
  return meta(0, [0xff, 0x03, ...encodeVlq(text.length), ...text]);
}
/** FF 51 03 tttttt: µs per quarter note = round(60 000 000 / bpm) (120 BPM → 500000 = 07 A1 20). */
function tempo(bpm: number): TrackEvent {
  const us = Math.round(60_000_000 / bpm);
  return meta(1, [0xff, 0x51, 0x03, (us >> 16) & 0xff, (us >> 8) & 0xff, us & 0xff]);
}
/** FF 58 04 nn dd cc bb: numerator, log2(denominator), 24 MIDI clocks per click, 8 32nds per quarter. */
function timeSignature(num: number, den: number): TrackEvent {
  return meta(2, [0xff, 0x58, 0x04, num, Math.round(Math.log2(den)), 24, 8]);
}
/** 9n kk vv: note on. */
function noteOn(tick: number, channel: number, key: number, velocity: number): TrackEvent {
  return channelMessage(tick, 4, 0x90 | (channel - 1), key, velocity);
}
/** 8n kk 40: note off (release velocity 64). Ranked before note-ons at the same tick. */
function noteOff(tick: number, channel: number, key: number): TrackEvent {
  return channelMessage(tick, 3, 0x80 | (channel - 1), key, 0x40);
}

/** Sorts by absolute tick (stable, then rank), writes delta ticks (VLQ), ends with FF 2F 00; returns the MTrk chunk. */
function encodeTrack(events: TrackEvent[]): Uint8Array {
  let sorted = true;
  for (let i = 1; i < events.length && sorted; i++) {
    const p = events[i - 1];
    const e = events[i];
    if (e.tick < p.tick || (e.tick === p.tick && e.rank < p.rank)) sorted = false;
  }
  // Array.prototype.sort is stable (ES2019), so equal ticks and ranks keep their order.
  const order = sorted ? events : [...events].sort((x, y) => x.tick - y.tick || x.rank - y.rank);
  let size = 8 + 4;
  for (const e of order) size += 4 + e.n;
  const out = new Uint8Array(size);
  let at = 8;
  let now = 0;
  for (const e of order) {
    at = writeVlq(out, at, e.tick - now);
    if (e.bytes) for (let k = 0; k < e.n; k++) out[at++] = e.bytes[k];
    else {
      out[at++] = e.b0;
      out[at++] = e.b1;
      out[at++] = e.b2;
    }
    now = e.tick;
  }
  out[at++] = 0x00;
  out[at++] = 0xff;
  out[at++] = 0x2f;
  out[at++] = 0x00;
  out.set([0x4d, 0x54, 0x72, 0x6b, ...u32(at - 8)], 0);
  return out.subarray(0, at);
}

/**
 * A track whose channel messages arrive already in time order (a lane's
 * controller stream): written straight into bytes, delta ticks as VLQ,
 * without an event list to sort. Starts with `head` (meta events at tick 0).
 */
class OrderedTrackWriter {
  private buf = new Uint8Array(1 << 16);
  private at = 8;
  private now = 0;
  constructor(head: TrackEvent[]) {
    for (const e of head) this.event(e);
  }
  private room(n: number) {
    if (this.at + n <= this.buf.length) return;
    const next = new Uint8Array(Math.max(this.buf.length * 2, this.at + n));
    next.set(this.buf.subarray(0, this.at));
    this.buf = next;
  }
  event(e: TrackEvent) {
    if (e.bytes) {
      this.room(4 + e.n);
      this.at = writeVlq(this.buf, this.at, e.tick - this.now);
      this.buf.set(e.bytes, this.at);
      this.at += e.n;
      this.now = e.tick;
    } else this.channel(e.tick, e.b0, e.b1, e.b2);
  }
  /** A three-byte channel message, e.g. Bn cc vv (control change, n = channel − 1). */
  channel(tick: number, b0: number, b1: number, b2: number) {
    if (tick < this.now) throw new RangeError('OrderedTrackWriter: events out of order');
    this.room(7);
    this.at = writeVlq(this.buf, this.at, tick - this.now);
    this.buf[this.at++] = b0;
    this.buf[this.at++] = b1;
    this.buf[this.at++] = b2;
    this.now = tick;
  }
  /** Ends the track with FF 2F 00 and returns the MTrk chunk. */
  finish(): Uint8Array {
    this.room(4);
    this.buf[this.at++] = 0x00;
    this.buf[this.at++] = 0xff;
    this.buf[this.at++] = 0x2f;
    this.buf[this.at++] = 0x00;
    this.buf.set([0x4d, 0x54, 0x72, 0x6b, ...u32(this.at - 8)], 0);
    return this.buf.subarray(0, this.at);
  }
}

function u32(v: number): number[] {
  return [(v >>> 24) & 0xff, (v >>> 16) & 0xff, (v >>> 8) & 0xff, v & 0xff];
}

/** One lane of the file: a named track of controller changes. */
export interface MidiLane {
  name: string;
  curve: GainCurve;
}

export interface MidiMarker {
  timeSec: number;
  /** 0..1 → velocity round(127·strength), at least 1. */
  strength?: number;
}

/** GM1 percussion: 36 = bass drum 1, channel 10 (REFERENCES.md "General MIDI percussion map"). */
const MARKER_KEY = 36;
const MARKER_CHANNEL = 10;

/**
 * The controller stream of a curve on the tick grid: the value at tick 0,
 * then the curve's value at every tick (time = tick·60/(bpm·ppq)) where it
 * changes, kept only when it differs from the last one written (no repeated
 * values). Values v = round(fullScale·10^(G/40)), 0 at or below the floor
 * (`gainDbToCc7` with fullScale 127, `gainDbToCc14` with 16383). Inside a
 * segment (straight in dB) 10^(G/40) is geometric in the tick, so it is
 * advanced by one multiplication per tick and re-anchored at every breakpoint.
 * `visit` gets each (tick, value) in ascending tick order.
 */
export function forEachCcChange(curve: GainCurve, bpm: number, ppq: number, fullScale: number, visit: (tick: number, value: number) => void): void {
  const p = curve.points;
  if (p.length === 0) return;
  const floorDb = curve.floorDb ?? -Infinity;
  const toValue = (gainDb: number) => (gainDb <= floorDb ? 0 : Math.max(0, Math.min(fullScale, Math.round(fullScale * Math.pow(10, gainDb / 40)))));
  const xFloor = Math.pow(10, floorDb / 40);
  const ticksPerSec = (bpm * ppq) / 60;
  let written = -1;
  let pendingTick = 0;
  let pendingValue = toValue(p[0].gainDb);
  // The value a tick ends with counts; it is written when it differs from the last one written.
  const at = (tick: number, value: number) => {
    if (tick !== pendingTick) {
      if (pendingValue !== written) {
        visit(pendingTick, pendingValue);
        written = pendingValue;
      }
      pendingTick = tick;
    }
    pendingValue = value;
  };
  for (let i = 0; i + 1 < p.length; i++) {
    const a = p[i];
    const b = p[i + 1];
    const kStart = Math.max(1, Math.ceil(a.timeSec * ticksPerSec - 1e-9));
    const kEnd = Math.floor(b.timeSec * ticksPerSec + 1e-9);
    if (kStart > kEnd) continue;
    if (a.gainDb === b.gainDb) {
      at(kStart, toValue(a.gainDb));
      continue;
    }
    const dbPerTick = (b.gainDb - a.gainDb) / ((b.timeSec - a.timeSec) * ticksPerSec);
    const ratio = Math.pow(10, dbPerTick / 40);
    let x = Math.pow(10, (a.gainDb + dbPerTick * (kStart - a.timeSec * ticksPerSec)) / 40);
    const xLo = Math.pow(10, Math.min(a.gainDb, b.gainDb) / 40);
    const xHi = Math.pow(10, Math.max(a.gainDb, b.gainDb) / 40);
    for (let k = kStart; k <= kEnd; k++, x *= ratio) {
      const xc = x < xLo ? xLo : x > xHi ? xHi : x;
      at(k, xc <= xFloor ? 0 : Math.min(fullScale, Math.round(fullScale * xc)));
    }
  }
  if (pendingValue !== written) visit(pendingTick, pendingValue);
}

/** `forEachCcChange` as an array. */
export function ccStream(curve: GainCurve, bpm: number, ppq: number, fullScale = 127): { tick: number; value: number }[] {
  const out: { tick: number; value: number }[] = [];
  forEachCcChange(curve, bpm, ppq, fullScale, (tick, value) => out.push({ tick, value }));
  return out;
}

/**
 * Writes a Standard MIDI File, type 1 (MMA RP-001): division = ppq ticks per
 * quarter; track 1 holds the name, tempo (FF 51) and time signature (FF 58);
 * then one track per lane, named after it, with control changes on `cc` and
 * `channel`; then, with `markerTrack`, a track with a note (GM 36, channel 10,
 * a 32nd note long) at each hit. tick = round(seconds × bpm/60 × ppq).
 * 14-bit: MSB on CC n, LSB on CC n+32, the LSB after its MSB (setting the MSB
 * resets the LSB, MIDI 1.0), only the LSB when only it changes.
 */
export function writeMidiCc(lanes: readonly MidiLane[], options: MidiExportOptionsInput = {}, hits: readonly MidiMarker[] = [], title = 'Tuckline'): Uint8Array {
  const o = midiExportOptionsSchema.parse(options);
  const tracks: Uint8Array[] = [];
  tracks.push(encodeTrack([trackName(title), tempo(o.bpm), timeSignature(o.timeSignature[0], o.timeSignature[1])]));
  for (const lane of lanes) {
    // The controller stream comes in tick order: it is written as it comes.
    const w = new OrderedTrackWriter([trackName(lane.name)]);
    const status = 0xb0 | (o.channel - 1);
    if (o.fourteenBit) {
      let lastMsb = -1;
      forEachCcChange(lane.curve, o.bpm, o.ppq, 16383, (tick, value) => {
        const msb = value >> 7;
        if (msb !== lastMsb) w.channel(tick, status, o.cc, msb);
        w.channel(tick, status, o.cc + 32, value & 0x7f);
        lastMsb = msb;
      });
    } else {
      forEachCcChange(lane.curve, o.bpm, o.ppq, 127, (tick, value) => w.channel(tick, status, o.cc, value));
    }
    tracks.push(w.finish());
  }
  if (o.markerTrack) {
    const events: TrackEvent[] = [trackName('Kick hits')];
    const len = Math.max(1, Math.round(o.ppq / 8));
    for (const h of hits) {
      const tick = Math.max(0, secondsToTicks(h.timeSec, o.bpm, o.ppq));
      const velocity = Math.max(1, Math.min(127, Math.round(127 * (h.strength ?? 1))));
      events.push(noteOn(tick, MARKER_CHANNEL, MARKER_KEY, velocity), noteOff(tick + len, MARKER_CHANNEL, MARKER_KEY));
    }
    tracks.push(encodeTrack(events));
  }
  const header = [0x4d, 0x54, 0x68, 0x64, 0, 0, 0, 6, 0, 1, (tracks.length >> 8) & 0xff, tracks.length & 0xff, (o.ppq >> 8) & 0x7f, o.ppq & 0xff];
  let size = header.length;
  for (const t of tracks) size += t.length;
  const bytes = new Uint8Array(size);
  bytes.set(header, 0);
  let at = header.length;
  for (const t of tracks) {
    bytes.set(t, at);
    at += t.length;
  }
  return bytes;
}
