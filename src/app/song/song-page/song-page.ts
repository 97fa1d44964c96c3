import { ChangeDetectionStrategy, Component, computed, inject, input } from '@angular/core';
import { rxResource } from '@angular/core/rxjs-interop';
import { MatButtonModule } from '@angular/material/button';
import { MatDialog } from '@angular/material/dialog';
import { MatProgressBarModule } from '@angular/material/progress-bar';
import { Router, RouterLink } from '@angular/router';
import { Song } from '../../../../shared/schemas/song';
import { SongsApi } from '../../core/api/songs-api';
import { AuthService } from '../../core/auth/auth.service';
import { toApiFailure } from '../../core/http/api-error';
import { SongFormDialog, SongFormDialogData } from '../../songs/song-form-dialog/song-form-dialog';
import { Icon } from '../../ui/icon/icon';
import { StepBar } from '../step-bar/step-bar';
import { StepId, isStepId, stepsFor } from '../song-steps';

@Component({
  selector: 'tl-song-page',
  imports: [RouterLink, MatButtonModule, MatProgressBarModule, Icon, StepBar],
  templateUrl: './song-page.html',
  styleUrl: './song-page.scss',
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class SongPage {
  private readonly api = inject(SongsApi);
  private readonly auth = inject(AuthService);
  private readonly dialog = inject(MatDialog);
  private readonly router = inject(Router);

  /** Route parameter and `?step=` query parameter (router input binding). */
  readonly songId = input.required<string>();
  readonly step = input<string | undefined>();

  protected readonly song = rxResource({
    params: () => {
      const team = this.auth.team();
      return team ? { teamId: team.id, songId: this.songId() } : undefined;
    },
    stream: ({ params }) => this.api.get(params.teamId, params.songId),
  });

  protected readonly activeStep = computed<StepId>(() => {
    const step = this.step();
    return isStepId(step) ? step : 'stems';
  });
  protected readonly steps = computed(() => (this.song.hasValue() ? stepsFor(this.song.value()) : []));
  protected readonly activeView = computed(() => this.steps().find((s) => s.id === this.activeStep()) ?? null);
  protected readonly errorMessage = computed(() => {
    const err = this.song.error();
    return err ? toApiFailure((err as { cause?: unknown }).cause ?? err).message : null;
  });
  protected readonly canEdit = computed(() => this.auth.role() !== null && this.auth.can('editSongs'));

  protected openStep(step: StepId): void {
    void this.router.navigate([], { queryParams: { step }, queryParamsHandling: 'merge', replaceUrl: true });
  }

  protected edit(song: Song): void {
    const data: SongFormDialogData = { teamId: song.teamId, song };
    this.dialog
      .open<SongFormDialog, SongFormDialogData, Song>(SongFormDialog, { data, width: '560px' })
      .afterClosed()
      .subscribe((updated) => {
        if (updated) this.song.set(updated);
      });
  }
}
