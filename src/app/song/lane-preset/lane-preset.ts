import { ChangeDetectionStrategy, Component, computed, effect, inject, input, signal } from '@angular/core';
import { FormsModule } from '@angular/forms';
import { MatButtonModule } from '@angular/material/button';
import { MatDialog } from '@angular/material/dialog';
import { MatFormFieldModule } from '@angular/material/form-field';
import { MatInputModule } from '@angular/material/input';
import { MatSelectModule } from '@angular/material/select';
import { MatSnackBar } from '@angular/material/snack-bar';
import { filter, switchMap } from 'rxjs';
import type { LaneDto } from '../../../../shared/schemas/lane';
import { genreSchema, type PresetDto } from '../../../../shared/schemas/preset';
import { PresetsApi } from '../../core/api/presets-api';
import { AuthService } from '../../core/auth/auth.service';
import { toApiFailure } from '../../core/http/api-error';
import { confirmed } from '../../ui/confirm-dialog/confirm-dialog';
import { WorkspaceStore } from '../workspace/workspace-store';

/**
 * A lane and the team library: apply a preset (the lane remembers which one
 * and its version, and says when a newer version is out), or save the lane's
 * shape as a new preset.
 */
@Component({
  selector: 'tl-lane-preset',
  imports: [FormsModule, MatButtonModule, MatFormFieldModule, MatInputModule, MatSelectModule],
  templateUrl: './lane-preset.html',
  styleUrl: './lane-preset.scss',
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class LanePreset {
  private readonly store = inject(WorkspaceStore);
  private readonly api = inject(PresetsApi);
  private readonly dialog = inject(MatDialog);
  private readonly snack = inject(MatSnackBar);
  private readonly auth = inject(AuthService);

  readonly lane = input.required<LaneDto>();
  /** May apply presets (every role may apply published ones). */
  readonly canApply = input(true);

  protected readonly presets = signal<PresetDto[]>([]);
  protected readonly chosen = signal<string | null>(null);
  protected readonly busy = signal(false);
  protected readonly error = signal<string | null>(null);
  protected readonly saving = signal(false);
  protected readonly saveName = signal('');
  protected readonly saveGenre = signal('');

  /** Engineers and owners may make presets (shared/schemas/team.ts). */
  protected readonly canSave = computed(() => this.auth.role() !== null && this.auth.can('editPresets'));
  protected readonly newer = computed(() => {
    const l = this.lane();
    return l.presetId && l.presetLatestVersion != null && l.presetVersion != null && l.presetLatestVersion > l.presetVersion ? l.presetLatestVersion : null;
  });
  protected readonly genres = computed(() => [...new Set(this.presets().map((p) => p.genre))].sort());

  constructor() {
    effect(() => {
      const song = this.store.song();
      if (!song) return;
      this.api.list(song.teamId, { sort: 'genre', order: 'asc' }).subscribe({ next: (list) => this.presets.set(list.filter((p) => p.status !== 'retired')), error: () => this.presets.set([]) });
    });
  }

  protected label(p: PresetDto): string {
    return `${p.name} · v${p.version}${p.status === 'draft' ? ' (draft)' : ''}`;
  }

  protected presetsOf(genre: string): PresetDto[] {
    return this.presets().filter((p) => p.genre === genre);
  }

  /** Applies the chosen preset (or, with `presetId`, updates to that preset's newest version). */
  protected apply(presetId = this.chosen()): void {
    const song = this.store.song();
    const lane = this.lane();
    if (!song || !presetId) return;
    const dirty = this.store.dirtyLaneIds().includes(lane.id);
    const go = () => {
      this.busy.set(true);
      this.error.set(null);
      this.api.applyToLane(song.teamId, song.id, lane.id, presetId).subscribe({
        next: (saved) => {
          this.store.lanes.update((list) => list.map((l) => (l.id === saved.id ? saved : l)));
          this.store.discardShape(saved);
          this.busy.set(false);
          this.snack.open(`Applied ${saved.presetName ?? 'the preset'} v${saved.presetVersion} to ${saved.name}.`, undefined, { duration: 4000 });
        },
        error: (e: unknown) => {
          this.error.set(toApiFailure(e).message);
          this.busy.set(false);
        },
      });
    };
    if (!dirty) return go();
    confirmed(this.dialog, {
      title: 'Replace your unsaved edits?',
      message: `${lane.name} has tuck edits that are not saved. Applying the preset replaces the shape with the preset's.`,
      confirmLabel: 'Apply preset',
    }).subscribe(go);
  }

  protected saveAsPreset(): void {
    const song = this.store.song();
    const lane = this.lane();
    const genre = genreSchema.safeParse(this.saveGenre());
    if (!song || !this.saveName().trim()) {
      this.error.set('Name the preset.');
      return;
    }
    if (!genre.success) {
      this.error.set(genre.error.issues[0].message);
      return;
    }
    if (this.store.dirtyLaneIds().includes(lane.id)) {
      this.error.set('Save the lane first: a preset is made from the saved shape.');
      return;
    }
    this.busy.set(true);
    this.error.set(null);
    this.api
      .fromLane(song.teamId, { songId: song.id, laneId: lane.id, name: this.saveName().trim(), genre: genre.data })
      .pipe(switchMap((created) => this.api.list(song.teamId, { sort: 'genre', order: 'asc' }).pipe(filter(() => !!created))))
      .subscribe({
        next: (list) => {
          this.presets.set(list.filter((p) => p.status !== 'retired'));
          this.saving.set(false);
          this.busy.set(false);
          this.snack.open(`Saved "${this.saveName().trim()}" as a draft preset. Publish it in the library to share it.`, undefined, { duration: 5000 });
        },
        error: (e: unknown) => {
          this.error.set(toApiFailure(e).message);
          this.busy.set(false);
        },
      });
  }
}
