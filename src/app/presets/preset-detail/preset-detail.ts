import { DatePipe, DecimalPipe } from '@angular/common';
import { ChangeDetectionStrategy, Component, DestroyRef, computed, inject, input, signal } from '@angular/core';
import { rxResource, takeUntilDestroyed } from '@angular/core/rxjs-interop';
import { MatButtonModule } from '@angular/material/button';
import { MatChipsModule } from '@angular/material/chips';
import { MatDialog } from '@angular/material/dialog';
import { MatProgressBarModule } from '@angular/material/progress-bar';
import { MatSnackBar } from '@angular/material/snack-bar';
import { MatTableModule } from '@angular/material/table';
import { MatTooltipModule } from '@angular/material/tooltip';
import { RouterLink } from '@angular/router';
import { Observable, filter, switchMap } from 'rxjs';
import { PresetDto, PresetVersionDto } from '../../../../shared/schemas/preset';
import { describeShape } from '../../../../shared/schemas/tuck-shape';
import { PresetsApi } from '../../core/api/presets-api';
import { AuthService } from '../../core/auth/auth.service';
import { toApiFailure } from '../../core/http/api-error';
import { ConfirmDialog, ConfirmDialogData } from '../../ui/confirm-dialog/confirm-dialog';
import { Icon } from '../../ui/icon/icon';
import { ShapeThumbnail } from '../../ui/shape-thumbnail/shape-thumbnail';
import { PresetActions } from '../preset-actions';

/** One preset: its shape and numbers, and its version history with view, compare and restore. */
@Component({
  selector: 'tl-preset-detail',
  imports: [DatePipe, DecimalPipe, RouterLink, MatButtonModule, MatChipsModule, MatTableModule, MatProgressBarModule, MatTooltipModule, Icon, ShapeThumbnail],
  templateUrl: './preset-detail.html',
  styleUrl: './preset-detail.scss',
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class PresetDetail {
  private readonly api = inject(PresetsApi);
  private readonly auth = inject(AuthService);
  private readonly actions = inject(PresetActions);
  private readonly dialog = inject(MatDialog);
  private readonly snackBar = inject(MatSnackBar);
  private readonly destroyRef = inject(DestroyRef);

  /** From the route (`/presets/:presetId`). */
  readonly presetId = input.required<string>();

  protected readonly mayEdit = computed(() => this.auth.role() !== null && this.auth.can('editPresets'));
  protected readonly versionColumns = ['version', 'savedBy', 'savedAt', 'actions'];
  private readonly key = computed(() => {
    const team = this.auth.team();
    return team ? { teamId: team.id, presetId: this.presetId() } : undefined;
  });
  protected readonly preset = rxResource({ params: () => this.key(), stream: ({ params }) => this.api.get(params.teamId, params.presetId) });
  protected readonly versions = rxResource({ params: () => this.key(), stream: ({ params }) => this.api.versions(params.teamId, params.presetId) });
  protected readonly busy = signal(false);
  protected readonly restoreError = signal<string | null>(null);

  /** The version picked in the history, shown alone or drawn with the current one. */
  protected readonly picked = signal<{ version: number; mode: 'view' | 'compare' } | null>(null);
  protected readonly pickedVersion = computed<PresetVersionDto | null>(() => {
    const p = this.picked();
    if (!p || !this.versions.hasValue()) return null;
    return this.versions.value().find((v) => v.version === p.version) ?? null;
  });
  protected readonly summary = computed(() => (this.preset.hasValue() ? describeShape(this.preset.value().shape) : null));
  protected readonly pickedSummary = computed(() => {
    const v = this.pickedVersion();
    return v ? describeShape(v.content.shape) : null;
  });
  protected readonly errorMessage = computed(() => {
    const err = this.preset.error();
    return err ? toApiFailure(err).message : null;
  });

  protected exportUrl(p: PresetDto): string {
    return this.api.exportUrl(p.teamId, p.id);
  }

  protected view(v: PresetVersionDto): void {
    this.picked.set({ version: v.version, mode: 'view' });
  }

  protected compare(v: PresetVersionDto): void {
    this.picked.set({ version: v.version, mode: 'compare' });
  }

  protected edit(p: PresetDto): void {
    this.run(this.actions.openForm(p.teamId, p));
  }
  protected duplicate(p: PresetDto): void {
    this.actions.duplicate(p.teamId, p).pipe(takeUntilDestroyed(this.destroyRef)).subscribe();
  }
  protected publish(p: PresetDto): void {
    this.run(this.actions.publish(p.teamId, p));
  }
  protected unpublish(p: PresetDto): void {
    this.run(this.actions.unpublish(p.teamId, p));
  }
  protected retire(p: PresetDto): void {
    this.run(this.actions.retire(p.teamId, p));
  }

  /** Saves the old content as a new version (history is never rewritten). */
  protected restore(p: PresetDto, v: PresetVersionDto): void {
    this.restoreError.set(null);
    const data: ConfirmDialogData = {
      title: `Restore version ${v.version}?`,
      message: `Its shape and settings become version ${p.version + 1} of “${p.name}”. Version ${p.version} stays in the history.`,
      confirmLabel: 'Restore',
    };
    this.dialog
      .open<ConfirmDialog, ConfirmDialogData, boolean>(ConfirmDialog, { data, width: '440px' })
      .afterClosed()
      .pipe(
        filter((ok) => ok === true),
        switchMap(() => {
          this.busy.set(true);
          return this.api.restore(p.teamId, p.id, v.version, p.version);
        }),
        takeUntilDestroyed(this.destroyRef),
      )
      .subscribe({
        next: (saved) => {
          this.busy.set(false);
          this.picked.set(null);
          this.snackBar.open(`Version ${v.version} restored as version ${saved.version}.`, undefined, { duration: 4000 });
          this.reload();
        },
        error: (err: unknown) => {
          this.busy.set(false);
          const failure = toApiFailure(err);
          this.restoreError.set(failure.code === 'presets.stale' ? `${failure.message} The history below is now up to date.` : failure.message);
          this.reload();
        },
      });
  }

  private run(action: Observable<PresetDto>): void {
    action.pipe(takeUntilDestroyed(this.destroyRef)).subscribe(() => this.reload());
  }

  private reload(): void {
    this.preset.reload();
    this.versions.reload();
  }
}
