import { DatePipe } from '@angular/common';
import { ChangeDetectionStrategy, Component, inject, input } from '@angular/core';
import { MatButtonModule } from '@angular/material/button';
import { MatDialog } from '@angular/material/dialog';
import { MatTableModule } from '@angular/material/table';
import { ExportDto } from '../../../../shared/schemas/export-request';
import { formatBytes } from '../stems-panel/upload-queue';
import { WorkspaceStore } from '../workspace/workspace-store';
import { ExportDialog, ExportDialogData } from './export-dialog';

const formatNames = { csv: 'CSV', midi: 'MIDI CC', wav: 'WAV' } as const;

/** Exports of the song: make a new one, download any again. */
@Component({
  selector: 'tl-export-panel',
  imports: [DatePipe, MatButtonModule, MatTableModule],
  templateUrl: './export-panel.html',
  styleUrl: './export-panel.scss',
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class ExportPanel {
  protected readonly store = inject(WorkspaceStore);
  private readonly dialog = inject(MatDialog);

  readonly canExport = input(true);

  protected readonly columns = ['fileName', 'format', 'lanes', 'bytes', 'createdBy', 'createdAt', 'download'];
  protected readonly formatBytes = formatBytes;

  protected formatName(exp: ExportDto): string {
    return formatNames[exp.format];
  }

  protected laneNames(exp: ExportDto): string {
    return exp.laneIds.map((id) => this.store.lanes().find((l) => l.id === id)?.name ?? 'removed lane').join(', ');
  }

  protected url(exp: ExportDto): string {
    return this.store.exportUrl(exp);
  }

  protected open(): void {
    const data: ExportDialogData = { lanes: this.store.lanes(), store: this.store, preselectLaneId: this.store.selectedLane()?.id ?? null };
    this.dialog
      .open<ExportDialog, ExportDialogData, ExportDto>(ExportDialog, { data, width: '600px' })
      .afterClosed()
      .subscribe((exp) => {
        if (exp) this.download(exp);
      });
  }

  /** The server names the file (song, lane, kind, date); the link only starts the download. */
  private download(exp: ExportDto): void {
    const a = document.createElement('a');
    a.href = this.url(exp);
    a.download = exp.fileName;
    document.body.appendChild(a);
    a.click();
    a.remove();
  }
}
