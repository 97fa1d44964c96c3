import type { HeadroomReportDto } from '../../shared/schemas/report';
import type { Song } from '../../shared/schemas/song';
import { escapeHtml } from '../http/html';

const db = (v: number | null | undefined, unit: string) => (v == null || !Number.isFinite(v) ? '—' : `${v.toFixed(1)} ${unit}`);

/**
 * A printable one-page summary of the headroom report, to send with the mix
 * notes (the browser's "Print → Save as PDF" makes the PDF). Plain HTML and
 * CSS only, no script, so it prints the same everywhere.
 */
export function reportHtml(song: Song, report: HeadroomReportDto): string {
  const figures = (label: string, f: HeadroomReportDto['sum']['before']) =>
    `<td class="label">${label}</td><td>${db(f.samplePeakDbfs, 'dBFS')}</td><td>${db(f.truePeakDbtp, 'dBTP')}</td><td>${db(f.integratedLufs, 'LUFS')}</td><td>${db(f.maxShortTermLufs, 'LUFS')}</td>`;
  const laneRows = report.lanes
    .map((l) => `<tr><th rowspan="2">${escapeHtml(l.name)}</th>${figures('before', l.before)}</tr><tr>${figures('after', l.after)}</tr>`)
    .join('');
  const flagged = report.phase?.hits.filter((h) => h.flag) ?? [];
  const s = report.phase?.suggestion;
  return `<!doctype html><html lang="en"><head><meta charset="utf-8"><title>Headroom report · ${escapeHtml(song.title)}</title>
<style>
body{font-family:'Source Sans 3',Arial,sans-serif;color:#111a24;max-width:760px;margin:32px auto;font-variant-numeric:tabular-nums}
h1{font-size:22px;margin:0}h2{font-size:16px;margin-top:28px}p.meta{color:#4a5563;margin:4px 0 16px}
table{border-collapse:collapse;width:100%}th,td{border-bottom:1px solid #d5dbe3;padding:6px 8px;text-align:right}th:first-child,td:first-child,td.label{text-align:left}
.big{font-size:28px;font-weight:700;color:#0f6c75}@media print{body{margin:0}}
</style></head><body>
<h1>Headroom report — ${escapeHtml(song.title)}</h1>
<p class="meta">${escapeHtml(song.artistAlias)} · ${song.bpm} BPM · ${report.sampleRateHz} Hz · ${report.durationSec.toFixed(1)} s · measured ${escapeHtml(report.computedAt.slice(0, 16).replace('T', ' '))} UTC by Tuckline</p>
<p>Headroom gained on kick + bass: <span class="big">${db(report.headroomGainedDb.samplePeak, 'dB')}</span> sample peak, <strong>${db(report.headroomGainedDb.truePeak, 'dB')}</strong> true peak.</p>
<h2>Kick + bass</h2>
<table><tr><th></th><th></th><th>Sample peak</th><th>True peak</th><th>Integrated</th><th>Max short-term</th></tr>
<tr><th rowspan="2">Sum</th>${figures('before', report.sum.before)}</tr><tr>${figures('after', report.sum.after)}</tr>${laneRows}</table>
<h2>Phase check (low band)</h2>
<p>${flagged.length} of ${report.phase?.hits.length ?? 0} hits flagged (${flagged.filter((h) => h.flag === 'adds').length} adding up, ${flagged.filter((h) => h.flag === 'cancels').length} cancelling).
${s ? `Suggestion: ${s.invertBass ? 'flip the bass polarity' : 'keep the polarity'}${s.offsetMs ? ` and move the bass ${Math.abs(s.offsetMs)} ms ${s.offsetMs < 0 ? 'earlier' : 'later'}` : ''} — mean low-band correlation ${s.meanCorrelationNow.toFixed(2)} → ${s.meanCorrelationSuggested.toFixed(2)}. Advice only; nothing was changed.` : ''}</p>
<p class="meta">Sample peak in dBFS; true peak in dBTP (ITU-R BS.1770-4 Annex 2, 4× oversampling); loudness in LUFS (ITU-R BS.1770-4, gated; short-term over 3 s per EBU Tech 3341).</p>
</body></html>`;
}
