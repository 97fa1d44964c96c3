import { curveArrays, type GainCurve } from '../dsp/gain-curve';
import { amplitudeMemo, type DbMemo } from '../dsp/gain-memo';
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
  // per-row strings: a song's CSV has tens of thousands of rows).
  let buf = new Uint8Array(HEADER.length + 2 + count * 48 + MAX_ROW_BYTES);
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
  const memo = amplitudeMemo();
  let lastMicros = -1;
  let lastGain = NaN;
  let milliDb = 0;
  let linMicro = 0;
  for (let i = 0; i < count; i++) {
    const t = Math.max(0, timeSec[i]);
    const g = gainDb[i];
    const micros = Math.round(t * 1e6);
    if (micros === lastMicros) continue;
    lastMicros = micros;
    if (g !== lastGain) {
      lastGain = g;
      milliDb = Math.round(g * 1000);
      linMicro = roundedMicroGain(memo, g);
    }
    if (at + MAX_ROW_BYTES > buf.length) {
      const next = new Uint8Array(buf.length * 2);
      next.set(buf.subarray(0, at));
      buf = next;
    }
    at = putFixed(buf, at, micros, 6);
    buf[at++] = 44;
    at = putFixed(buf, at, milliDb, 3);
    buf[at++] = 44;
    at = putUint(buf, at, Math.round(t * sampleRate));
    buf[at++] = 44;
    // bar.beat.tick, as secondsToBarBeatTick (bar-beat.ts) computes it. Ticks never
    // fall (times rise), so with whole ticks per beat the bar and beat are counted
    // on from the last row's (exact in integers; no division per row).
    const ticks = Math.round(t * ticksPerSec);
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
    at = putUint(buf, at, bar + 1);
    buf[at++] = 46;
    at = putUint(buf, at, beat + 1);
    buf[at++] = 46;
    at = putUint(buf, at, Math.round(inBar - beat * ticksPerBeat));
    buf[at++] = 44;
    at = putFixed(buf, at, linMicro, 6);
    buf[at++] = 13;
    buf[at++] = 10;
  }
  return buf.subarray(0, at);
}

const HEADER = CSV_COLUMNS.join(',');

/**
 * Most bytes a row can take: five numbers of at most 17 digits (2^53), a sign,
 * decimal points, separators and CRLF — with room to spare.
 */
const MAX_ROW_BYTES = 160;

const POW10 = [1, 10, 100, 1e3, 1e4, 1e5, 1e6, 1e7, 1e8, 1e9];

/**
 * round(10^(G/20)·10^6), as `Math.round(Math.pow(10, G / 20) * 1e6)` gives it:
 * through `Math.exp` (`amplitudeMemo`, a fraction of `Math.pow`'s time here), which
 * differs by a few ulps, so a value within 10^−12 (relative) of a rounding tie
 * is redone with `Math.pow`.
 */
function roundedMicroGain(memo: DbMemo, gainDb: number): number {
  const y = memo.of(gainDb) * 1e6;
  const tie = y - Math.floor(y) - 0.5;
  if ((tie < 0 ? -tie : tie) <= y * 1e-12) return Math.round(Math.pow(10, gainDb / 20) * 1e6);
  return Math.round(y);
}

/** ASCII digit pairs "00" … "99": the tens digit of n at 2n, the units at 2n + 1. */
const DIGIT_PAIRS = new Uint8Array(200);
for (let n = 0; n < 100; n++) {
  DIGIT_PAIRS[2 * n] = 48 + Math.floor(n / 10);
  DIGIT_PAIRS[2 * n + 1] = 48 + (n % 10);
}

/** Decimal digits of a non-negative integer below 2^53 (at least 1). */
function digitCount(v: number): number {
  if (v < 1e4) return v < 10 ? 1 : v < 100 ? 2 : v < 1e3 ? 3 : 4;
  if (v < 1e8) return v < 1e5 ? 5 : v < 1e6 ? 6 : v < 1e7 ? 7 : 8;
  let digits = 9;
  for (let p = 1e9; p <= v; p *= 10) digits++;
  return digits;
}

/** Writes a non-negative integer in decimal at `at`; returns the index after it. */
function putUint(buf: Uint8Array, at: number, v: number): number {
  const end = at + digitCount(v);
  let i = end;
  let x = v;
  while (x > 0x7fffffff) {
    const q = Math.floor(x / 10);
    buf[--i] = 48 + x - q * 10;
    x = q;
  }
  let s = x | 0;
  while (s >= 100) {
    const q = (s / 100) | 0;
    const r = 2 * (s - q * 100);
    buf[--i] = DIGIT_PAIRS[r + 1];
    buf[--i] = DIGIT_PAIRS[r];
    s = q;
  }
  if (s >= 10) {
    buf[--i] = DIGIT_PAIRS[2 * s + 1];
    buf[--i] = DIGIT_PAIRS[2 * s];
  } else buf[--i] = 48 + s;
  return end;
}

/**
 * Writes an integer count of 10^−decimals (decimals ≤ 9) as a fixed-point
 * decimal at `at`, zero without a sign; returns the index after it.
 */
function putFixed(buf: Uint8Array, at: number, scaled: number, decimals: number): number {
  if (scaled < 0) {
    buf[at++] = 45;
    scaled = -scaled;
  }
  const unit = POW10[decimals];
  const whole = Math.floor(scaled / unit);
  let frac = (scaled - whole * unit) | 0;
  at = putUint(buf, at, whole);
  buf[at] = 46;
  const end = at + 1 + decimals;
  let i = end;
  while (i - at > 2) {
    const q = (frac / 100) | 0;
    const r = 2 * (frac - q * 100);
    buf[--i] = DIGIT_PAIRS[r + 1];
    buf[--i] = DIGIT_PAIRS[r];
    frac = q;
  }
  if (i - at > 1) buf[--i] = 48 + frac;
  return end;
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
