import { curveArrays, type GainCurve } from '../dsp/gain-curve';
import { NEPER_PER_DB } from '../dsp/gain-memo';
import { roundNonNegative } from './rounding';
import { csvExportOptionsSchema, type CsvExportOptionsInput } from '../schemas/export-options';

/** The header, in column order. */
export const CSV_COLUMNS = ['time_s', 'gain_db', 'sample', 'bar_beat_tick', 'gain_linear'] as const;

/**
 * Writes a gain curve as breakpoint CSV (RFC 4180: comma-separated, CRLF line
 * ends, a header record first, no quoting needed because no field holds a comma,
 * quote or line break; '.' decimal point, no comment lines).
 * Columns: time_s (seconds, 6 decimals = 1 µs), gain_db (3 decimals),
 * sample (round(time_s × sampleRate)), bar_beat_tick (at the song's tempo,
 * 1-based bars and beats), gain_linear (10^(dB/20), 6 decimals).
 * Rows whose rounded time equals the previous row's are dropped, so times rise strictly.
 * Numbers are rounded half away from zero at their last decimal.
 */
export function writeBreakpointCsv(curve: GainCurve, options: CsvExportOptionsInput = {}): string {
  return asciiToString(writeBreakpointCsvBytes(curve, options));
}

/** writeBreakpointCsv as the file's bytes (ASCII, so UTF-8 too): what a file or a download needs, without a string between. */
export function writeBreakpointCsvBytes(curve: GainCurve, options: CsvExportOptionsInput = {}): Uint8Array {
  const o = csvExportOptionsSchema.parse(options);
  const [num, den] = o.timeSignature;
  const ticksPerBeat = (o.ppq * 4) / den;
  const ticksPerBar = ticksPerBeat * num;
  const ticksPerSec = (o.bpm * o.ppq) / 60;
  const sampleRate = o.sampleRate;
  const { timeSec, gainDb } = curveArrays(curve);
  const count = timeSec.length;
  // Rows are written as ASCII into one buffer with integer arithmetic (no
  // per-row strings: a song's CSV has tens of thousands of rows), two or four
  // bytes a store through a DataView where it can (a byte at a time, the
  // stores alone took most of the time).
  let buf = new Uint8Array(HEADER.length + 2 + count * 48 + MAX_ROW_BYTES);
  let view = new DataView(buf.buffer);
  let at = 0;
  for (let i = 0; i < HEADER.length; i++) buf[at++] = HEADER.charCodeAt(i);
  buf[at++] = 13;
  buf[at++] = 10;
  const wholeBeats = Number.isInteger(ticksPerBeat);
  let bar = 0;
  let barStart = 0;
  let nextBar = 0;
  let beat = 0;
  let nextBeat = 0;
  const gainText = new GainFieldText();
  let lastMicros = -1;
  for (let i = 0; i < count; i++) {
    const t = Math.max(0, timeSec[i]);
    const micros = roundNonNegative(t * 1e6);
    if (micros === lastMicros) continue;
    lastMicros = micros;
    if (at + MAX_ROW_BYTES > buf.length) {
      const next = new Uint8Array(buf.length * 2);
      next.set(buf.subarray(0, at));
      buf = next;
      view = new DataView(buf.buffer);
    }
    const seconds = Math.floor(micros / 1e6);
    at = putUint(view, at, seconds);
    view.setUint8(at, 46);
    at = putDigits6(view, at + 1, micros - seconds * 1e6);
    const slot = gainText.slot(gainDb[i]);
    at = gainText.putDb(view, at, slot);
    at = putUint(view, at, roundNonNegative(t * sampleRate));
    view.setUint8(at++, 44);
    // bar.beat.tick, as secondsToBarBeatTick (bar-beat.ts) computes it. Ticks never
    // fall (times rise), so with whole ticks per beat the bar and beat are counted
    // on from the last row's (exact in integers; no division per row).
    const ticks = roundNonNegative(t * ticksPerSec);
    if (wholeBeats) {
      if (ticks >= nextBar) {
        bar = Math.floor(ticks / ticksPerBar);
        barStart = bar * ticksPerBar;
        nextBar = barStart + ticksPerBar;
        beat = 0;
        nextBeat = barStart + ticksPerBeat;
      }
      while (ticks >= nextBeat) {
        beat++;
        nextBeat += ticksPerBeat;
      }
    } else {
      bar = Math.floor(ticks / ticksPerBar);
      barStart = bar * ticksPerBar;
      beat = Math.floor((ticks - barStart) / ticksPerBeat);
    }
    const inBar = ticks - barStart;
    at = putUint(view, at, bar + 1);
    view.setUint8(at++, 46);
    at = putUint(view, at, beat + 1);
    view.setUint8(at++, 46);
    at = putUint(view, at, Math.round(inBar - beat * ticksPerBeat));
    at = gainText.putLinear(view, at, slot);
  }
  return buf.subarray(0, at);
}

const HEADER = CSV_COLUMNS.join(',');

/**
 * Most bytes a row can take: five numbers of at most 17 digits (2^53), a sign,
 * decimal points, separators and CRLF — with room to spare, also for the
 * 16 bytes `GainFieldText` stores whatever its text's length.
 */
const MAX_ROW_BYTES = 160;

/** Slots of the gain text memo (a power of two: 2^12). */
const GAIN_SLOTS = 4096;
/** Bytes a slot holds for each of its two texts. */
const GAIN_TEXT_BYTES = 16;

/**
 * The text of a row's two gain fields — ",gain_db," and ",gain_linear\r\n" —
 * per gain, memoised in a direct-mapped table keyed by the exact dB value (as
 * `DbMemo`): a thinned curve repeats a few dozen gains at every hit, so most
 * rows copy both texts with four 4-byte stores each instead of rounding,
 * exponentiating and writing them digit by digit. A text too long for its slot
 * (a gain above +120 dB or below −10^9 dB) is written straight from the numbers instead.
 */
class GainFieldText {
  private readonly keys = new Float64Array(GAIN_SLOTS).fill(NaN);
  private readonly text = new Uint8Array(GAIN_SLOTS * 2 * GAIN_TEXT_BYTES);
  private readonly words = new DataView(this.text.buffer);
  private readonly lengths = new Uint8Array(GAIN_SLOTS * 2);
  private readonly bits = new Float64Array(1);
  private readonly halves = new Uint32Array(this.bits.buffer);
  /** Where a gain whose text is too long for a slot is kept (slot −1). */
  private longGainDb = 0;

  /** The slot holding the texts of `gainDb`, filled first if it holds another gain's; −1 if they do not fit. */
  slot(gainDb: number): number {
    this.bits[0] = gainDb;
    const slot = Math.imul(this.halves[0] ^ this.halves[1], 0x9e3779b1) >>> 20;
    return this.keys[slot] === gainDb ? slot : this.fill(slot, gainDb);
  }

  /** Writes the texts of `gainDb` into `slot`; returns the slot, or −1 if they do not fit. */
  private fill(slot: number, gainDb: number): number {
    const dbAt = slot * 2 * GAIN_TEXT_BYTES;
    const dbEnd = putMilliField(this.text, dbAt, roundedMilliDb(gainDb));
    const linAt = dbAt + GAIN_TEXT_BYTES;
    const linEnd = putLinearField(this.text, linAt, roundedMicroGain(gainDb));
    if (dbEnd - dbAt > GAIN_TEXT_BYTES || linEnd - linAt > GAIN_TEXT_BYTES) {
      this.keys[slot] = NaN;
      this.longGainDb = gainDb;
      return -1;
    }
    this.keys[slot] = gainDb;
    this.lengths[2 * slot] = dbEnd - dbAt;
    this.lengths[2 * slot + 1] = linEnd - linAt;
    return slot;
  }

  /** Writes ",gain_db," of the slot's gain at `at`; returns the index after it. */
  putDb(out: DataView, at: number, slot: number): number {
    if (slot < 0) return putMilliField(new Uint8Array(out.buffer), at, roundedMilliDb(this.longGainDb));
    this.copy(out, at, slot * 2 * GAIN_TEXT_BYTES);
    return at + this.lengths[2 * slot];
  }

  /** Writes ",gain_linear\r\n" of the slot's gain at `at`; returns the index after it. */
  putLinear(out: DataView, at: number, slot: number): number {
    if (slot < 0) return putLinearField(new Uint8Array(out.buffer), at, roundedMicroGain(this.longGainDb));
    this.copy(out, at, slot * 2 * GAIN_TEXT_BYTES + GAIN_TEXT_BYTES);
    return at + this.lengths[2 * slot + 1];
  }

  /** All 16 bytes of a text; the bytes past its length are overwritten by what follows. */
  private copy(out: DataView, at: number, from: number): void {
    const w = this.words;
    out.setUint32(at, w.getUint32(from, true), true);
    out.setUint32(at + 4, w.getUint32(from + 4, true), true);
    out.setUint32(at + 8, w.getUint32(from + 8, true), true);
    out.setUint32(at + 12, w.getUint32(from + 12, true), true);
  }
}

/** ",gain_db," from round(G·1000), into `buf` at `at`; returns the index after it. */
function putMilliField(buf: Uint8Array, at: number, milliDb: number): number {
  const view = new DataView(buf.buffer, buf.byteOffset);
  buf[at++] = 44;
  if (milliDb < 0) {
    buf[at++] = 45;
    milliDb = -milliDb;
  }
  const whole = Math.floor(milliDb / 1000);
  const frac = milliDb - whole * 1000;
  at = putUint(view, at, whole);
  const tenths = Math.floor(frac / 100);
  buf[at] = 46;
  buf[at + 1] = 48 + tenths;
  view.setUint16(at + 2, DIGIT_PAIRS[frac - tenths * 100], true);
  buf[at + 4] = 44;
  return at + 5;
}

/** ",gain_linear\r\n" from round(10^(G/20)·10^6), into `buf` at `at`; returns the index after it. */
function putLinearField(buf: Uint8Array, at: number, microGain: number): number {
  const view = new DataView(buf.buffer, buf.byteOffset);
  buf[at++] = 44;
  const whole = Math.floor(microGain / 1e6);
  at = putUint(view, at, whole);
  buf[at] = 46;
  at = putDigits6(view, at + 1, microGain - whole * 1e6);
  buf[at] = 13;
  buf[at + 1] = 10;
  return at + 2;
}

/** round(G·1000): gain_db in thousandths. */
function roundedMilliDb(gainDb: number): number {
  return Math.round(gainDb * 1000);
}

/**
 * round(10^(G/20)·10^6) as `Math.round(Math.pow(10, G / 20) * 1e6)` gives it,
 * through `Math.exp` (a fraction of `Math.pow`'s time here), which differs by a
 * few ulps, so a value within 10^−12 (relative) of a rounding tie is redone
 * with `Math.pow`.
 */
function roundedMicroGain(gainDb: number): number {
  const y = Math.exp(gainDb * NEPER_PER_DB) * 1e6;
  const tie = y - Math.floor(y) - 0.5;
  if ((tie < 0 ? -tie : tie) <= y * 1e-12) return Math.round(Math.pow(10, gainDb / 20) * 1e6);
  return Math.round(y);
}

/** ASCII digit pairs "00" … "99" as little-endian 16-bit words: the tens digit, then the units. */
const DIGIT_PAIRS = new Uint16Array(100);
for (let n = 0; n < 100; n++) DIGIT_PAIRS[n] = 48 + Math.floor(n / 10) + ((48 + (n % 10)) << 8);

/** Writes a non-negative integer below 2^53 in decimal at `at`; returns the index after it. */
function putUint(out: DataView, at: number, v: number): number {
  if (v < 10000) return putUpTo4(out, at, v);
  if (v >= 1e8) return putLongUint(out, at, v);
  const high = (v / 10000) | 0;
  at = putUpTo4(out, at, high);
  putDigits4(out, at, v - high * 10000);
  return at + 4;
}

/** Writes 0 ≤ v < 10^4 in decimal at `at`; returns the index after it. */
function putUpTo4(out: DataView, at: number, v: number): number {
  if (v < 10) {
    out.setUint8(at, 48 + v);
    return at + 1;
  }
  if (v < 100) {
    out.setUint16(at, DIGIT_PAIRS[v], true);
    return at + 2;
  }
  const high = (v / 100) | 0;
  if (high < 10) {
    out.setUint8(at, 48 + high);
    out.setUint16(at + 1, DIGIT_PAIRS[v - high * 100], true);
    return at + 3;
  }
  putDigits4(out, at, v);
  return at + 4;
}

/** Writes 0 ≤ v < 10^4 as exactly four digits (leading zeros) at `at`, one 4-byte store. */
function putDigits4(out: DataView, at: number, v: number): void {
  const high = (v / 100) | 0;
  out.setUint32(at, DIGIT_PAIRS[high] | (DIGIT_PAIRS[v - high * 100] << 16), true);
}

/** `putUint` for v ≥ 10^8: a digit a store from the right above 2^31, then two. */
function putLongUint(out: DataView, at: number, v: number): number {
  let digits = 9;
  for (let p = 1e9; p <= v; p *= 10) digits++;
  const end = at + digits;
  let i = end;
  let x = v;
  while (x > 0x7fffffff) {
    const q = Math.floor(x / 10);
    out.setUint8(--i, 48 + x - q * 10);
    x = q;
  }
  let s = x | 0;
  while (s >= 100) {
    const q = (s / 100) | 0;
    i -= 2;
    out.setUint16(i, DIGIT_PAIRS[s - q * 100], true);
    s = q;
  }
  if (s >= 10) out.setUint16(i - 2, DIGIT_PAIRS[s], true);
  else out.setUint8(i - 1, 48 + s);
  return end;
}

/** Writes 0 ≤ v < 10^6 as exactly six digits (leading zeros) at `at`; returns the index after them. */
function putDigits6(out: DataView, at: number, v: number): number {
  const hi = (v / 10000) | 0;
  const rest = v - hi * 10000;
  const mid = (rest / 100) | 0;
  out.setUint16(at, DIGIT_PAIRS[hi], true);
  out.setUint16(at + 2, DIGIT_PAIRS[mid], true);
  out.setUint16(at + 4, DIGIT_PAIRS[rest - mid * 100], true);
  return at + 6;
}

/** ASCII bytes → string. */
function asciiToString(bytes: Uint8Array): string {
  // TextDecoder is a Web-platform global (WHATWG Encoding; browsers and Node alike), not in ES2022's lib.
  const Decoder = (globalThis as { TextDecoder?: new () => { decode(bytes: Uint8Array): string } }).TextDecoder;
  if (Decoder) return new Decoder().decode(bytes);
  const parts: string[] = [];
  // fromCharCode takes the typed array as its argument list (array-like), 8 KiB at a time.
  for (let i = 0; i < bytes.length; i += 8192) parts.push(String.fromCharCode.apply(null, bytes.subarray(i, Math.min(bytes.length, i + 8192)) as unknown as number[]));
  return parts.join('');
}
