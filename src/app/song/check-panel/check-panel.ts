import { ChangeDetectionStrategy, Component, computed, effect, inject, signal } from '@angular/core';
import { DecimalPipe } from '@angular/common';
import { MatButtonModule } from '@angular/material/button';
import { MatProgressBarModule } from '@angular/material/progress-bar';
import type { LevelFigures } from '../../../../shared/dsp/headroom';
import type { HeadroomReportDto } from '../../../../shared/schemas/report';
import { ReportApi } from '../../core/api/report-api';
import { toApiFailure } from '../../core/http/api-error';
import { WorkspaceStore } from '../workspace/workspace-store';
import { HitPeaksChart } from './hit-peaks-chart';
import { PreviewPlayer } from '../preview-player/preview-player';

interface FigureRow {
  label: string;
  before: LevelFigures;
  after: LevelFigures;
}

/** The Check step: what the tucks did — the headroom report, per-hit peaks, the phase check, and a preview to listen. */
@Component({
  selector: 'tl-check-panel',
  imports: [DecimalPipe, MatButtonModule, MatProgressBarModule, HitPeaksChart, PreviewPlayer],
  templateUrl: './check-panel.html',
  styleUrl: './check-panel.scss',
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class CheckPanel {
  protected readonly store = inject(WorkspaceStore);
  private readonly api = inject(ReportApi);

  protected readonly report = signal<HeadroomReportDto | null>(null);
  protected readonly measuring = signal(false);
  protected readonly error = signal<string | null>(null);

  protected readonly rows = computed<FigureRow[]>(() => {
    const r = this.report();
    if (!r) return [];
    return [{ label: 'Kick + bass', before: r.sum.before, after: r.sum.after }, ...r.lanes.map((l) => ({ label: `${l.name} (bass alone)`, before: l.before, after: l.after }))];
  });
  protected readonly flagged = computed(() => this.report()?.phase?.hits.filter((h) => h.flag) ?? []);
  protected readonly printable = computed(() => {
    const song = this.store.song();
    return song ? this.api.printableUrl(song.teamId, song.id) : null;
  });

  constructor() {
    // Measure once the song has hits and lanes; again on demand after saving edits.
    effect(() => {
      if (this.store.song() && this.store.hitMap() && this.store.lanes().length && !this.report() && !this.measuring() && !this.error()) this.measure();
    });
  }

  protected measure(): void {
    const song = this.store.song();
    if (!song) return;
    this.measuring.set(true);
    this.error.set(null);
    this.api.report(song.teamId, song.id).subscribe({
      next: (r) => {
        this.report.set(r);
        this.store.checked.set(true);
        this.measuring.set(false);
      },
      error: (e: unknown) => {
        this.error.set(toApiFailure(e).message);
        this.measuring.set(false);
      },
    });
  }

  /** dB with one decimal and its unit; silence shows as a dash. */
  protected db(value: number | null | undefined): string {
    return value == null || !Number.isFinite(value) ? '—' : value.toFixed(1);
  }

  protected delta(before: number | null, after: number | null): string {
    if (before == null || after == null || !Number.isFinite(before) || !Number.isFinite(after)) return '—';
    const d = after - before;
    return `${d > 0 ? '+' : d < 0 ? '−' : '±'}${Math.abs(d).toFixed(1)}`;
  }

  protected suggestion(): string {
    const s = this.report()?.phase?.suggestion;
    if (!s) return '';
    if (!s.invertBass && s.offsetMs === 0) return 'Keep the bass as it is: no polarity flip or small offset lines the low end up better.';
    const parts = [s.invertBass ? 'flip the bass polarity' : null, s.offsetMs ? `move the bass ${Math.abs(s.offsetMs).toFixed(1)} ms ${s.offsetMs < 0 ? 'earlier' : 'later'}` : null].filter(Boolean);
    return `Try to ${parts.join(' and ')}: the mean low-band correlation would go from ${s.meanCorrelationNow.toFixed(2)} to ${s.meanCorrelationSuggested.toFixed(2)}.`;
  }

  protected hitTime(sec: number): string {
    return `${sec.toFixed(3)} s`;
  }
}
