import type { GainCurve } from '../dsp/gain-curve';
import { csvExportOptionsSchema, type CsvExportOptionsInput } from '../schemas/export-options';
import { formatBarBeatTick, secondsToBarBeatTick } from './bar-beat';

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
 */
export function writeBreakpointCsv(curve: GainCurve, options: CsvExportOptionsInput = {}): string {
  const o = csvExportOptionsSchema.parse(options);
  const lines: string[] = [CSV_COLUMNS.join(',')];
  let lastTime = '';
  let lastGain = NaN;
  let lastGainText = '';
  let lastLinear = '';
  for (const p of curve.points) {
    const t = Math.max(0, p.timeSec);
    const time = fixed(t, 6);
    if (time === lastTime) continue;
    lastTime = time;
    // Flat runs repeat their gain: format it once.
    if (p.gainDb !== lastGain) {
      lastGain = p.gainDb;
      lastGainText = fixed(p.gainDb, 3);
      lastLinear = fixed(Math.pow(10, p.gainDb / 20), 6);
    }
    const bbt = formatBarBeatTick(secondsToBarBeatTick(t, o.bpm, o.timeSignature, o.ppq));
    lines.push(`${time},${lastGainText},${Math.round(t * o.sampleRate)},${bbt},${lastLinear}`);
  }
  return lines.join('\r\n') + '\r\n';
}

/** Fixed decimals with '.' and no "-0.000". */
function fixed(x: number, decimals: number): string {
  const s = x.toFixed(decimals);
  return s.charCodeAt(0) === 45 && Number(s) === 0 ? s.slice(1) : s;
}
