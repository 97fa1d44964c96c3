import { ChangeDetectionStrategy, Component, DestroyRef, inject, signal } from '@angular/core';
import { takeUntilDestroyed } from '@angular/core/rxjs-interop';
import { NonNullableFormBuilder, ReactiveFormsModule } from '@angular/forms';
import { MatButtonModule } from '@angular/material/button';
import { MAT_DIALOG_DATA, MatDialogModule, MatDialogRef } from '@angular/material/dialog';
import { MatFormFieldModule } from '@angular/material/form-field';
import { MatInputModule } from '@angular/material/input';
import { MatProgressBarModule } from '@angular/material/progress-bar';
import { MatSelectModule } from '@angular/material/select';
import { Song, songInputSchema, timeSignatureSchema } from '../../../../shared/schemas/song';
import { SongsApi } from '../../core/api/songs-api';
import { applyServerIssues, fieldError, zodValidator } from '../../core/forms/zod-validator';
import { toApiFailure } from '../../core/http/api-error';

export interface SongFormDialogData {
  teamId: string;
  /** Present when editing an existing song. */
  song?: Song;
}

@Component({
  selector: 'tl-song-form-dialog',
  imports: [ReactiveFormsModule, MatDialogModule, MatFormFieldModule, MatInputModule, MatSelectModule, MatButtonModule, MatProgressBarModule],
  templateUrl: './song-form-dialog.html',
  styleUrl: './song-form-dialog.scss',
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class SongFormDialog {
  private readonly api = inject(SongsApi);
  private readonly dialogRef = inject<MatDialogRef<SongFormDialog, Song>>(MatDialogRef);
  private readonly destroyRef = inject(DestroyRef);
  protected readonly data = inject<SongFormDialogData>(MAT_DIALOG_DATA);

  private readonly fb = inject(NonNullableFormBuilder);
  protected readonly form = this.fb.group({
    title: [this.data.song?.title ?? '', zodValidator(songInputSchema.shape.title)],
    artistAlias: [this.data.song?.artistAlias ?? '', zodValidator(songInputSchema.shape.artistAlias)],
    bpm: this.fb.control<number | null>(this.data.song?.bpm ?? null, zodValidator(songInputSchema.shape.bpm)),
    timeSignature: this.fb.group({
      beats: [this.data.song?.timeSignature.beats ?? 4, zodValidator(timeSignatureSchema.shape.beats)],
      beatUnit: [this.data.song?.timeSignature.beatUnit ?? 4, zodValidator(timeSignatureSchema.shape.beatUnit)],
    }),
    notes: [this.data.song?.notes ?? '', zodValidator(songInputSchema.shape.notes)],
  });
  protected readonly beatUnits = [2, 4, 8, 16] as const;
  protected readonly busy = signal(false);
  protected readonly formError = signal<string | null>(null);
  protected readonly fieldError = fieldError;

  protected submit(): void {
    this.formError.set(null);
    const parsed = songInputSchema.safeParse(this.form.getRawValue());
    if (!parsed.success) {
      this.form.markAllAsTouched();
      return;
    }
    this.busy.set(true);
    const request = this.data.song
      ? this.api.update(this.data.teamId, this.data.song.id, parsed.data)
      : this.api.create(this.data.teamId, parsed.data);
    request.pipe(takeUntilDestroyed(this.destroyRef)).subscribe({
      next: (song) => this.dialogRef.close(song),
      error: (err: unknown) => {
        this.busy.set(false);
        const failure = toApiFailure(err);
        const rest = applyServerIssues(this.form, failure.issues);
        this.formError.set(failure.issues.length && !rest.length ? null : failure.message);
      },
    });
  }
}
