import { ChangeDetectionStrategy, Component, computed, inject, signal } from '@angular/core';
import { FormsModule } from '@angular/forms';
import { MatButtonModule } from '@angular/material/button';
import { MatCheckboxModule } from '@angular/material/checkbox';
import { MAT_DIALOG_DATA, MatDialogModule, MatDialogRef } from '@angular/material/dialog';
import { MatFormFieldModule } from '@angular/material/form-field';
import { MatInputModule } from '@angular/material/input';
import { MatProgressBarModule } from '@angular/material/progress-bar';
import { MatRadioModule } from '@angular/material/radio';
import { MatSelectModule } from '@angular/material/select';
import { ExportDto, ExportFormat, ExportRequest, exportRequestSchema } from '../../../../shared/schemas/export-request';
import { LaneDto } from '../../../../shared/schemas/lane';
import { toApiFailure } from '../../core/http/api-error';
import { WorkspaceStore } from '../workspace/workspace-store';

export interface ExportDialogData {
  lanes: LaneDto[];
  store: WorkspaceStore;
  preselectLaneId: string | null;
}

const formatWords: Record<ExportFormat, { title: string; detail: string }> = {
  csv: { title: 'Breakpoint CSV', detail: 'Time, bar.beat.tick and gain per breakpoint, one lane per file.' },
  midi: { title: 'MIDI CC file', detail: 'Controller automation, one track per lane, tempo from the song.' },
  wav: { title: 'Rendered WAV', detail: 'The lane’s bass stem with the tucks applied, one lane per file.' },
};

/** Format, lanes and the format's options; creates the export and hands the file to the browser. */
@Component({
  selector: 'tl-export-dialog',
  imports: [FormsModule, MatDialogModule, MatButtonModule, MatRadioModule, MatCheckboxModule, MatFormFieldModule, MatInputModule, MatSelectModule, MatProgressBarModule],
  templateUrl: './export-dialog.html',
  styleUrl: './export-dialog.scss',
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class ExportDialog {
  private readonly ref = inject<MatDialogRef<ExportDialog, ExportDto>>(MatDialogRef);
  protected readonly data = inject<ExportDialogData>(MAT_DIALOG_DATA);
  protected readonly formats = (Object.keys(formatWords) as ExportFormat[]).map((id) => ({ id, ...formatWords[id] }));

  protected readonly format = signal<ExportFormat>('csv');
  protected readonly laneIds = signal<string[]>(this.data.preselectLaneId ? [this.data.preselectLaneId] : this.data.lanes.slice(0, 1).map((l) => l.id));
  protected readonly cc = signal(11);
  protected readonly channel = signal(1);
  protected readonly ppq = signal(960);
  protected readonly fourteenBit = signal(false);
  protected readonly markerTrack = signal(false);
  protected readonly sampleRate = signal(48000);
  protected readonly busy = signal(false);
  protected readonly error = signal<string | null>(null);
  protected readonly oneLane = computed(() => this.format() !== 'midi');
  protected readonly ccProblem = computed(() => (this.format() === 'midi' && this.fourteenBit() && this.cc() > 31 ? '14-bit controllers need CC 0–31 (the fine half goes on CC n+32).' : null));

  protected pickFormat(f: ExportFormat): void {
    this.format.set(f);
    if (f !== 'midi') this.laneIds.update((ids) => ids.slice(0, 1));
  }

  protected toggleLane(id: string, on: boolean): void {
    this.laneIds.update((ids) => (on ? [...ids.filter((x) => x !== id), id] : ids.filter((x) => x !== id)));
  }

  protected request(): ExportRequest {
    const f = this.format();
    const options =
      f === 'midi'
        ? { cc: this.cc(), channel: this.channel(), ppq: this.ppq(), fourteenBit: this.fourteenBit(), markerTrack: this.markerTrack() }
        : f === 'csv'
          ? { ppq: this.ppq(), sampleRate: this.sampleRate() }
          : { sampleRate: this.sampleRate() };
    return { format: f, laneIds: this.laneIds(), options };
  }

  protected submit(): void {
    this.error.set(null);
    if (this.ccProblem()) return;
    const parsed = exportRequestSchema.safeParse(this.request());
    if (!parsed.success) {
      this.error.set(parsed.error.issues[0]?.message ?? 'Check the options.');
      return;
    }
    this.busy.set(true);
    this.data.store.createExport(parsed.data).subscribe({
      next: (exp) => this.ref.close(exp),
      error: (err: unknown) => {
        this.busy.set(false);
        this.error.set(toApiFailure(err).message);
      },
    });
  }
}
