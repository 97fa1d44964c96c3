import { ChangeDetectionStrategy, Component, DestroyRef, computed, effect, inject, input, signal, untracked } from '@angular/core';
import { rxResource, takeUntilDestroyed } from '@angular/core/rxjs-interop';
import { MatButtonModule } from '@angular/material/button';
import { MatDialog } from '@angular/material/dialog';
import { MatProgressBarModule } from '@angular/material/progress-bar';
import { Router, RouterLink } from '@angular/router';
import { Observable, map, of } from 'rxjs';
import { Song } from '../../../../shared/schemas/song';
import { SongsApi } from '../../core/api/songs-api';
import { AuthService } from '../../core/auth/auth.service';
import { toApiFailure } from '../../core/http/api-error';
import { SongFormDialog, SongFormDialogData } from '../../songs/song-form-dialog/song-form-dialog';
import { ConfirmDialog, ConfirmDialogData, confirmed } from '../../ui/confirm-dialog/confirm-dialog';
import { Icon } from '../../ui/icon/icon';
import { CheckPanel } from '../check-panel/check-panel';
import { ExportPanel } from '../export-panel/export-panel';
import { HitsPanel } from '../hits-panel/hits-panel';
import { StemsPanel } from '../stems-panel/stems-panel';
import { StepBar } from '../step-bar/step-bar';
import { StepId, isStepId, stepsFor } from '../song-steps';
import { Timeline } from '../timeline/timeline';
import { TuckPanel } from '../tuck-panel/tuck-panel';
import { WorkspaceStore } from '../workspace/workspace-store';

@Component({
  selector: 'tl-song-page',
  imports: [RouterLink, MatButtonModule, MatProgressBarModule, Icon, StepBar, Timeline, StemsPanel, HitsPanel, TuckPanel, CheckPanel, ExportPanel],
  providers: [WorkspaceStore],
  templateUrl: './song-page.html',
  styleUrl: './song-page.scss',
  changeDetection: ChangeDetectionStrategy.OnPush,
  host: {
    '(window:beforeunload)': 'onBeforeUnload($event)',
    '(document:keydown)': 'onKey($event)',
  },
})
export class SongPage {
  private readonly api = inject(SongsApi);
  private readonly auth = inject(AuthService);
  private readonly dialog = inject(MatDialog);
  private readonly router = inject(Router);
  private readonly destroyRef = inject(DestroyRef);
  protected readonly store = inject(WorkspaceStore);

  /** Route parameter and `?step=` query parameter (router input binding). */
  readonly songId = input.required<string>();
  readonly step = input<string | undefined>();

  protected readonly songResource = rxResource({
    params: () => {
      const team = this.auth.team();
      return team ? { teamId: team.id, songId: this.songId() } : undefined;
    },
    stream: ({ params }) => this.api.get(params.teamId, params.songId),
  });
  protected readonly workspaceError = signal<string | null>(null);
  protected readonly range = signal<{ fromSec: number; toSec: number } | null>(null);

  protected readonly song = computed(() => this.store.song() ?? (this.songResource.hasValue() ? this.songResource.value() : null));
  protected readonly activeStep = computed<StepId>(() => {
    const step = this.step();
    return isStepId(step) ? step : 'stems';
  });
  protected readonly steps = computed(() => {
    const song = this.song();
    if (!song) return [];
    const stems = this.store.currentStems();
    return stepsFor(song, {
      hasKickSource: stems.length ? this.store.kickStem() !== null : undefined,
      hasBassStem: stems.length ? this.store.bassStems().length > 0 : undefined,
      lanesWithShape: this.store.hitMap() ? this.store.lanes().length : 0,
      exportCount: this.store.exports().length,
      checked: this.store.checked(),
    });
  });
  protected readonly errorMessage = computed(() => {
    const err = this.songResource.error();
    return err ? toApiFailure(err).message : this.workspaceError();
  });
  protected readonly canEdit = computed(() => this.auth.role() !== null && this.auth.can('editSongs'));
  protected readonly canPrepare = computed(() => this.auth.role() !== null && this.auth.can('prepareSongs'));
  protected readonly canDelete = computed(() => this.auth.role() !== null && this.auth.can('deleteSongs'));
  protected readonly canEditLanes = computed(() => this.auth.role() !== null && this.auth.can('editLanes'));
  protected readonly canExport = computed(() => this.auth.role() !== null && this.auth.can('export'));

  constructor() {
    // Once the song record is in, load its workspace (stems, hits, lanes, exports).
    effect(() => {
      if (!this.songResource.hasValue()) return;
      const song = this.songResource.value();
      const team = this.auth.team();
      if (!team || untracked(() => this.store.song()?.id === song.id)) return;
      untracked(() =>
        this.store
          .load(team.id, song)
          .pipe(takeUntilDestroyed(this.destroyRef))
          .subscribe({ error: (err: unknown) => this.workspaceError.set(toApiFailure(err).message) }),
      );
    });
  }

  protected openStep(step: StepId): void {
    void this.router.navigate([], { queryParams: { step }, queryParamsHandling: 'merge', replaceUrl: true });
  }

  protected edit(song: Song): void {
    const data: SongFormDialogData = { teamId: song.teamId, song };
    this.dialog
      .open<SongFormDialog, SongFormDialogData, Song>(SongFormDialog, { data, width: '560px' })
      .afterClosed()
      .subscribe((updated) => {
        if (updated) this.store.song.set(updated);
      });
  }

  /** Deletes the song with its stems, hits, lanes and exports, after asking. */
  protected removeSong(song: Song): void {
    const data: ConfirmDialogData = {
      title: `Delete "${song.title}"?`,
      message: 'Its stems, hits, lanes and exports go with it. This cannot be undone.',
      confirmLabel: 'Delete song',
    };
    confirmed(this.dialog, data).subscribe(() => {
        this.store.discardAll();
        this.api.remove(song.teamId, song.id).subscribe(() => void this.router.navigate(['/songs']));
    });
  }

  protected toggleHit(index: number): void {
    this.store.selectedHit.set(index);
    if (this.canPrepare()) this.store.toggleHit(index)?.subscribe();
  }

  protected setRange(enabled: boolean): void {
    const r = this.range();
    if (!r) return;
    this.store.editHits({ range: { ...r, enabled } }).subscribe(() => this.range.set(null));
  }

  /** Asked by the route's leave guard. */
  confirmLeave(): Observable<boolean> {
    if (!this.store.hasUnsavedEdits()) return of(true);
    const names = this.store.lanes().filter((l) => this.store.dirtyLaneIds().includes(l.id)).map((l) => l.name).join(', ');
    const data: ConfirmDialogData = {
      title: 'Leave without saving the tuck?',
      message: `The shape of ${names} has changes that are not saved to the lane. Leaving drops them.`,
      confirmLabel: 'Leave and drop changes',
    };
    return this.dialog.open<ConfirmDialog, ConfirmDialogData, boolean>(ConfirmDialog, { data, width: '440px' }).afterClosed().pipe(map((ok) => ok === true));
  }

  protected onBeforeUnload(e: BeforeUnloadEvent): void {
    if (this.store.hasUnsavedEdits()) e.preventDefault();
  }

  protected onKey(e: KeyboardEvent): void {
    const target = e.target as HTMLElement | null;
    if (target && (target.tagName === 'INPUT' || target.tagName === 'TEXTAREA' || target.isContentEditable)) return;
    const step = this.activeStep();
    if (!(e.ctrlKey || e.metaKey) || (step !== 'tuck' && step !== 'hits')) return;
    const key = e.key.toLowerCase();
    const undo = key === 'z' && !e.shiftKey;
    const redo = (key === 'z' && e.shiftKey) || key === 'y';
    if (!undo && !redo) return;
    e.preventDefault();
    if (step === 'tuck') {
      if (undo) this.store.undo();
      else this.store.redo();
    } else if (this.canPrepare()) {
      (undo ? this.store.undoHits() : this.store.redoHits())?.subscribe();
    }
  }
}
