import { curveArrays, type GainCurve } from '../dsp/gain-curve';
import { midiExportOptionsSchema, type MidiExportOptionsInput } from '../schemas/export-options';
import { secondsToTicks } from './bar-beat';
import { encodeVlq, writeVlq } from './vlq';
import { DbMemo } from '../dsp/gain-memo';
import { roundNonNegative } from './rounding';

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
  return finishTrack(out, at);
}

/**
 * Closes a track whose events fill out[8, at): appends end of track
 * (delta 0, FF 2F 00), writes the chunk header "MTrk" and its length in
 * the 8 bytes left free at the start, and returns the chunk.
 */
function finishTrack(out: Uint8Array, at: number): Uint8Array {
  out[at++] = 0x00;
  out[at++] = 0xff;
  out[at++] = 0x2f;
  out[at++] = 0x00;
  out.set([0x4d, 0x54, 0x72, 0x6b, ...u32(at - 8)], 0);
  return out.subarray(0, at);
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

/** A lane's controller stream: `n` changes, ticks ascending, values 0 … full scale. */
export interface CcChanges {
  ticks: Float64Array;
  values: Uint16Array;
  n: number;
}

/** Makes room for `extra` more changes. */
function reserveCcChanges(s: CcChanges, extra: number): void {
  if (s.n + extra <= s.ticks.length) return;
  const size = Math.max(s.ticks.length * 2, s.n + extra);
  const ticks = new Float64Array(size);
  const values = new Uint16Array(size);
  ticks.set(s.ticks);
  values.set(s.values);
  s.ticks = ticks;
  s.values = values;
}

/**
 * The controller stream of a curve on the tick grid: the value at tick 0,
 * then the curve's value at every tick (time = tick·60/(bpm·ppq)) where it
 * changes, kept only when it differs from the last one written (no repeated
 * values). Values v = round(fullScale·10^(G/40)), 0 at or below the floor
 * (`gainDbToCc7` with fullScale 127, `gainDbToCc14` with 16383). Inside a
 * segment (straight in dB) 10^(G/40) is geometric in the tick, so it is
 * advanced by one multiplication per tick and re-anchored at every breakpoint;
 * a segment with one tick on it costs one `Math.exp` (its gain is clamped to
 * the segment in dB, which is where the running product clamps it; the same
 * value as `Math.pow` gives, see there).
 * The value a tick ends with counts (a breakpoint on a tick: the later segment's).
 * With `into`, its arrays are reused (grown if need be) and it is returned.
 */
export function ccChanges(curve: GainCurve, bpm: number, ppq: number, fullScale: number, into?: CcChanges): CcChanges {
  const { timeSec, gainDb } = curveArrays(curve);
  const count = timeSec.length;
  const out: CcChanges = into ?? { ticks: new Float64Array(count * 4 + 16), values: new Uint16Array(count * 4 + 16), n: 0 };
  out.n = 0;
  reserveCcChanges(out, count * 4 + 16);
  if (count === 0) return out;
  const floorDb = curve.floorDb ?? -Infinity;
  const xFloor = Math.pow(10, floorDb / 40);
  const ticksPerSec = (bpm * ppq) / 60;
  let pendingTick = 0;
  // 10^(G/40) of the breakpoints' gains, which repeat at every hit: the same Math.pow, memoised.
  const x40 = new DbMemo(powerOf10Over40);
  let pendingValue = ccValue(gainDb[0], floorDb, fullScale);
  for (let i = 0; i + 1 < count; i++) {
    const aT = timeSec[i];
    const aG = gainDb[i];
    const bT = timeSec[i + 1];
    const bG = gainDb[i + 1];
    const kStart = Math.max(1, Math.ceil(aT * ticksPerSec - 1e-9));
    const kEnd = Math.floor(bT * ticksPerSec + 1e-9);
    if (kStart > kEnd) continue;
    // A new tick makes the pending value final (the segment may start on the last one's tick).
    if (kStart !== pendingTick) {
      if (pendingValue !== lastWritten(out)) pushCcChange(out, pendingTick, pendingValue);
      pendingTick = kStart;
    }
    if (aG === bG) {
      pendingValue = aG <= floorDb ? 0 : Math.max(0, Math.min(fullScale, Math.round(fullScale * x40.of(aG))));
      continue;
    }
    const dbPerTick = (bG - aG) / ((bT - aT) * ticksPerSec);
    const gStart = aG + dbPerTick * (kStart - aT * ticksPerSec);
    const gLo = aG < bG ? aG : bG;
    const gHi = aG < bG ? bG : aG;
    if (kStart === kEnd) {
      pendingValue = oneTickValue(gStart < gLo ? gLo : gStart > gHi ? gHi : gStart, floorDb, xFloor, fullScale);
      continue;
    }
    pendingValue = rampTicks(out, kStart, kEnd, Math.pow(10, gStart / 40), Math.pow(10, dbPerTick / 40), x40.of(gLo), x40.of(gHi), xFloor, fullScale);
    pendingTick = kEnd;
  }
  if (pendingValue !== lastWritten(out)) pushCcChange(out, pendingTick, pendingValue);
  return out;
}

/** The last value written (−1 before the first): a change is written only when it differs from it. */
function lastWritten(out: CcChanges): number {
  return out.n > 0 ? out.values[out.n - 1] : -1;
}

/**
 * round(fullScale·10^(G/40)) of a segment's only tick, at gain `gainDb` (already
 * clamped to the segment), 0 at or below the floor. Through Math.exp, a third of
 * Math.pow's time; where that few-ulp difference could matter (within 1e-12 of a
 * rounding tie, or within 1e-9 dB of the floor) through Math.pow.
 */
function oneTickValue(gainDb: number, floorDb: number, xFloor: number, fullScale: number): number {
  const y = fullScale * Math.exp(gainDb * NEPER_PER_DB_40);
  const tie = y - Math.floor(y) - 0.5;
  const nearFloor = gainDb - floorDb;
  if ((tie < 0 ? -tie : tie) <= y * 1e-12 || (nearFloor < 0 ? -nearFloor : nearFloor) <= 1e-9) {
    const x = Math.pow(10, gainDb / 40);
    return x <= xFloor ? 0 : Math.min(fullScale, Math.round(fullScale * x));
  }
  return gainDb < floorDb ? 0 : Math.min(fullScale, Math.round(y));
}

/**
 * The ticks kStart … kEnd of a segment straight in dB, where x = 10^(G/40) is
 * x0 at kStart and grows by `ratio` a tick (clamped to the segment's [xLo, xHi]):
 * appends the changes at ticks kStart … kEnd − 1 and returns the value at kEnd,
 * which a breakpoint on that tick may still replace. Inside the segment each
 * tick has one value, so each is final at the next tick; it is stored always and
 * counted only when it differs from the last written (no branch on it: it is
 * taken about every other tick).
 */
function rampTicks(out: CcChanges, kStart: number, kEnd: number, x0: number, ratio: number, xLo: number, xHi: number, xFloor: number, fullScale: number): number {
  reserveCcChanges(out, kEnd - kStart);
  const { ticks, values } = out;
  let n = out.n;
  let written = lastWritten(out);
  let x = x0;
  let value = rampValue(x, xLo, xHi, xFloor, fullScale);
  for (let k = kStart + 1; k <= kEnd; k++) {
    x *= ratio;
    ticks[n] = k - 1;
    values[n] = value;
    n += value !== written ? 1 : 0;
    written = value;
    value = rampValue(x, xLo, xHi, xFloor, fullScale);
  }
  out.n = n;
  return value;
}

/** Appends one (tick, value) change, growing the arrays when full. */
function pushCcChange(out: CcChanges, tick: number, value: number): void {
  reserveCcChanges(out, 1);
  out.ticks[out.n] = tick;
  out.values[out.n++] = value;
}

/** round(fullScale·x) of x = 10^(G/40) clamped to the segment's [xLo, xHi], 0 at or below the floor. */
function rampValue(x: number, xLo: number, xHi: number, xFloor: number, fullScale: number): number {
  // Math.min and Math.max, not `x < xLo ? xLo : …`: a conditional choosing between x and
  // a parameter made x a boxed number in the optimised loop (a heap allocation per tick).
  const xc = Math.min(xHi, Math.max(xLo, x));
  return xc <= xFloor ? 0 : Math.min(fullScale, roundNonNegative(fullScale * xc));
}

/** 10^(G/40), as `Math.pow` gives it (one module function for the memo, not a closure per call: see gain-memo.ts). */
function powerOf10Over40(gainDb: number): number {
  return Math.pow(10, gainDb / 40);
}

/** ln10/40 per dB: 10^(G/40) = e^(G·ln10/40). */
const NEPER_PER_DB_40 = Math.LN10 / 40;

/** round(fullScale·10^(G/40)) within 0 … fullScale, 0 at or below the floor. */
function ccValue(gainDb: number, floorDb: number, fullScale: number): number {
  return gainDb <= floorDb ? 0 : Math.max(0, Math.min(fullScale, Math.round(fullScale * Math.pow(10, gainDb / 40))));
}

/** `ccChanges`, each (tick, value) handed to `visit` in ascending tick order. */
export function forEachCcChange(curve: GainCurve, bpm: number, ppq: number, fullScale: number, visit: (tick: number, value: number) => void): void {
  const s = ccChanges(curve, bpm, ppq, fullScale);
  for (let i = 0; i < s.n; i++) visit(s.ticks[i], s.values[i]);
}

/** `ccChanges` as an array. */
export function ccStream(curve: GainCurve, bpm: number, ppq: number, fullScale = 127): { tick: number; value: number }[] {
  const s = ccChanges(curve, bpm, ppq, fullScale);
  const out: { tick: number; value: number }[] = [];
  for (let i = 0; i < s.n; i++) out.push({ tick: s.ticks[i], value: s.values[i] });
  return out;
}

/**
 * A lane's track: its name (FF 03) at tick 0, then the controller stream as
 * control changes (Bn cc vv, full status on every event), delta ticks as VLQ,
 * ending with FF 2F 00; returns the MTrk chunk. The stream is already in tick
 * order, so it is encoded straight into one buffer of its largest size
 * (VLQ ≤ 4 bytes + 3 per event, two events per change at 14 bits).
 * 14-bit: MSB on CC n when it changes, then the LSB on CC n+32.
 */
function encodeCcTrack(name: string, stream: CcChanges, status: number, cc: number, fourteenBit: boolean): Uint8Array {
  const head = trackName(name).bytes!;
  const out = new Uint8Array(8 + 1 + head.length + stream.n * (fourteenBit ? 14 : 7) + 4);
  const view = new DataView(out.buffer);
  let at = 8;
  out[at++] = 0x00;
  out.set(head, at);
  at += head.length;
  const { ticks, values } = stream;
  let now = 0;
  let lastMsb = -1;
  for (let i = 0; i < stream.n; i++) {
    const tick = ticks[i];
    let delta = tick - now;
    if (delta < 0) throw new RangeError('encodeCcTrack: events out of order');
    now = tick;
    const value = values[i];
    if (fourteenBit) {
      const msb = value >> 7;
      if (msb !== lastMsb) {
        at = putControlChange(out, view, at, delta, status, cc, msb);
        lastMsb = msb;
        delta = 0;
      }
      at = putControlChange(out, view, at, delta, status, cc + 32, value & 0x7f);
    } else at = putControlChange(out, view, at, delta, status, cc, value);
  }
  return finishTrack(out, at);
}

/**
 * Delta ticks (VLQ), then Bn cc vv, at `at` of `out` (`view` over the same
 * bytes); returns the index after them. A delta under 0x80 is one byte, so
 * the whole event is one 4-byte store (most events: ticks a few apart).
 */
function putControlChange(out: Uint8Array, view: DataView, at: number, delta: number, status: number, cc: number, value: number): number {
  if (delta < 0x80) {
    view.setUint32(at, delta | (status << 8) | (cc << 16) | (value << 24), true);
    return at + 4;
  }
  at = writeVlq(out, at, delta);
  out[at] = status;
  out[at + 1] = cc;
  out[at + 2] = value;
  return at + 3;
}

/**
 * The controller stream of the lane being written, kept from call to call: a
 * song's is megabytes, and V8 answers that much new ArrayBuffer memory, call after
 * call, with full garbage collections. Each lane's stream is encoded before the
 * next is made. A stream of over 2^20 changes (10 MB) is not kept.
 */
let laneStream: CcChanges = { ticks: new Float64Array(0), values: new Uint16Array(0), n: 0 };
const KEPT_STREAM_CHANGES = 1 << 20;

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
  const status = 0xb0 | (o.channel - 1);
  for (const lane of lanes) tracks.push(encodeCcTrack(lane.name, ccChanges(lane.curve, o.bpm, o.ppq, o.fourteenBit ? 16383 : 127, laneStream), status, o.cc, o.fourteenBit));
  if (laneStream.ticks.length > KEPT_STREAM_CHANGES) laneStream = { ticks: new Float64Array(0), values: new Uint16Array(0), n: 0 };
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
