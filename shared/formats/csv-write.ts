import type { GainCurve } from '../dsp/gain-curve';
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
  const o = csvExportOptionsSchema.parse(options);
  const [num, den] = o.timeSignature;
  const ticksPerBeat = (o.ppq * 4) / den;
  const ticksPerBar = ticksPerBeat * num;
  const ticksPerSec = (o.bpm * o.ppq) / 60;
  // Rows are written as ASCII into one buffer with integer arithmetic (no
  // per-row strings: a song's CSV has tens of thousands of rows).
  const w = new AsciiWriter(64 + curve.points.length * 64);
  w.text(CSV_COLUMNS.join(','));
  w.crlf();
  let lastMicros = -1;
  let lastGain = NaN;
  let milliDb = 0;
  let linMicro = 0;
  for (const p of curve.points) {
    const t = Math.max(0, p.timeSec);
    const micros = Math.round(t * 1e6);
    if (micros === lastMicros) continue;
    lastMicros = micros;
    if (p.gainDb !== lastGain) {
      lastGain = p.gainDb;
      milliDb = Math.round(p.gainDb * 1000);
      linMicro = Math.round(Math.pow(10, p.gainDb / 20) * 1e6);
    }
    w.fixed(micros, 6);
    w.byte(44);
    w.fixed(milliDb, 3);
    w.byte(44);
    w.int(Math.round(t * o.sampleRate));
    w.byte(44);
    // bar.beat.tick, as secondsToBarBeatTick (bar-beat.ts) computes it.
    const ticks = Math.round(t * ticksPerSec);
    const bar = Math.floor(ticks / ticksPerBar);
    const inBar = ticks - bar * ticksPerBar;
    const beat = Math.floor(inBar / ticksPerBeat);
    w.int(bar + 1);
    w.byte(46);
    w.int(beat + 1);
    w.byte(46);
    w.int(Math.round(inBar - beat * ticksPerBeat));
    w.byte(44);
    w.fixed(linMicro, 6);
    w.crlf();
  }
  return w.toString();
}

const POW10 = [1, 10, 100, 1e3, 1e4, 1e5, 1e6, 1e7, 1e8, 1e9];

/** A growable ASCII byte buffer with integer and fixed-point number writers. */
class AsciiWriter {
  private buf: Uint8Array;
  private at = 0;
  private readonly digits = new Uint8Array(24);
  constructor(capacity: number) {
    this.buf = new Uint8Array(capacity);
  }
  private room(n: number) {
    if (this.at + n <= this.buf.length) return;
    const next = new Uint8Array(Math.max(this.buf.length * 2, this.at + n));
    next.set(this.buf.subarray(0, this.at));
    this.buf = next;
  }
  byte(b: number) {
    this.room(1);
    this.buf[this.at++] = b;
  }
  crlf() {
    this.room(2);
    this.buf[this.at++] = 13;
    this.buf[this.at++] = 10;
  }
  text(s: string) {
    this.room(s.length);
    for (let i = 0; i < s.length; i++) this.buf[this.at++] = s.charCodeAt(i) & 0x7f;
  }
  /** A non-negative integer in decimal. */
  int(v: number) {
    let n = 0;
    if (v < 0x7fffffff) {
      let i = v | 0;
      do {
        const q = (i / 10) | 0;
        this.digits[n++] = 48 + i - q * 10;
        i = q;
      } while (i > 0);
    } else {
      do {
        this.digits[n++] = 48 + (v % 10);
        v = Math.floor(v / 10);
      } while (v > 0);
    }
    this.room(n);
    while (n > 0) this.buf[this.at++] = this.digits[--n];
  }
  /** An integer count of 10^−decimals (decimals ≤ 9) as a fixed-point decimal; zero has no sign. */
  fixed(scaled: number, decimals: number) {
    if (scaled < 0) {
      this.byte(45);
      scaled = -scaled;
    }
    const unit = POW10[decimals];
    const whole = Math.floor(scaled / unit);
    let frac = (scaled - whole * unit) | 0;
    this.int(whole);
    this.room(decimals + 1);
    this.buf[this.at++] = 46;
    for (let i = decimals - 1; i >= 0; i--) {
      const q = (frac / 10) | 0;
      this.buf[this.at + i] = 48 + frac - q * 10;
      frac = q;
    }
    this.at += decimals;
  }
  toString(): string {
    // TextDecoder is a Web-platform global (WHATWG Encoding; browsers and Node alike), not in ES2022's lib.
    const Decoder = (globalThis as { TextDecoder?: new () => { decode(bytes: Uint8Array): string } }).TextDecoder;
    if (Decoder) return new Decoder().decode(this.buf.subarray(0, this.at));
    const parts: string[] = [];
    // fromCharCode takes the typed array as its argument list (array-like), 8 KiB at a time.
    for (let i = 0; i < this.at; i += 8192) parts.push(String.fromCharCode.apply(null, this.buf.subarray(i, Math.min(this.at, i + 8192)) as unknown as number[]));
    return parts.join('');
  }
}
