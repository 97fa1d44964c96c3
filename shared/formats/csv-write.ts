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
  for (const p of curve.points) {
    const time = fixed(Math.max(0, p.timeSec), 6);
    if (time === lastTime) continue;
    lastTime = time;
    const sample = Math.round(Math.max(0, p.timeSec) * o.sampleRate);
    const bbt = formatBarBeatTick(secondsToBarBeatTick(p.timeSec, o.bpm, o.timeSignature, o.ppq));
    lines.push(`${time},${fixed(p.gainDb, 3)},${sample},${bbt},${fixed(Math.pow(10, p.gainDb / 20), 6)}`);
  }
  return lines.join('\r\n') + '\r\n';
}

/** Fixed decimals with '.' and no "-0.000". */
function fixed(x: number, decimals: number): string {
  const s = x.toFixed(decimals);
  return /^-0\.?0*$/.test(s) ? s.slice(1) : s;
}
