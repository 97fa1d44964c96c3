import { DatePipe, NgTemplateOutlet } from '@angular/common';
import { ChangeDetectionStrategy, Component, DestroyRef, computed, inject, signal } from '@angular/core';
import { rxResource, takeUntilDestroyed, toObservable } from '@angular/core/rxjs-interop';
import { MatButtonModule } from '@angular/material/button';
import { MatButtonToggleModule } from '@angular/material/button-toggle';
import { MatCardModule } from '@angular/material/card';
import { MatChipsModule } from '@angular/material/chips';
import { MatFormFieldModule } from '@angular/material/form-field';
import { MatInputModule } from '@angular/material/input';
import { MatMenuModule } from '@angular/material/menu';
import { MatProgressBarModule } from '@angular/material/progress-bar';
import { MatSelectModule } from '@angular/material/select';
import { MatSnackBar } from '@angular/material/snack-bar';
import { MatSortModule, Sort } from '@angular/material/sort';
import { MatTableModule } from '@angular/material/table';
import { MatTooltipModule } from '@angular/material/tooltip';
import { RouterLink } from '@angular/router';
import { Observable, debounceTime, distinctUntilChanged, skip } from 'rxjs';
import { PresetDto, PresetStatus, presetSortKeys, suggestedGenres } from '../../../../shared/schemas/preset';
import { PresetsApi } from '../../core/api/presets-api';
import { AuthService } from '../../core/auth/auth.service';
import { toApiFailure } from '../../core/http/api-error';
import { Icon } from '../../ui/icon/icon';
import { shapeDomain } from '../../ui/shape-thumbnail/shape-geometry';
import { ShapeThumbnail } from '../../ui/shape-thumbnail/shape-thumbnail';
import { PresetActions } from '../preset-actions';

type SortKey = (typeof presetSortKeys)[number];
const viewKey = 'tuckline.presets.view';

@Component({
  selector: 'tl-presets-library',
  imports: [
    DatePipe,
    NgTemplateOutlet,
    RouterLink,
    MatTableModule,
    MatSortModule,
    MatFormFieldModule,
    MatInputModule,
    MatSelectModule,
    MatButtonModule,
    MatButtonToggleModule,
    MatCardModule,
    MatChipsModule,
    MatMenuModule,
    MatProgressBarModule,
    MatTooltipModule,
    Icon,
    ShapeThumbnail,
  ],
  templateUrl: './presets-library.html',
  styleUrl: './presets-library.scss',
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class PresetsLibrary {
  private readonly api = inject(PresetsApi);
  private readonly auth = inject(AuthService);
  private readonly actions = inject(PresetActions);
  private readonly snackBar = inject(MatSnackBar);
  private readonly destroyRef = inject(DestroyRef);

  protected readonly team = this.auth.team;
  /** Engineers and owners edit; assistants see published presets only and no edit controls. */
  protected readonly mayEdit = computed(() => this.auth.role() !== null && this.auth.can('editPresets'));
  protected readonly columns = computed(() => [
    'shape', 'name', 'genre', ...(this.mayEdit() ? ['status'] : []), 'version', 'updatedAt', 'useCount', 'author', 'actions',
  ]);

  protected readonly view = signal<'table' | 'cards'>(readView());
  protected readonly genre = signal<string>('');
  protected readonly status = signal<PresetStatus | ''>('');
  protected readonly searchText = signal('');
  private readonly q = signal('');
  protected readonly sort = signal<{ key: SortKey; order: 'asc' | 'desc' }>({ key: 'name', order: 'asc' });
  protected readonly busyId = signal<string | null>(null);
  protected readonly importError = signal<string | null>(null);
  protected readonly importing = signal(false);

  protected readonly presets = rxResource({
    params: () => {
      const team = this.team();
      if (!team) return undefined;
      return {
        teamId: team.id,
        query: { genre: this.genre() || undefined, q: this.q() || undefined, status: this.status() || undefined, sort: this.sort().key, order: this.sort().order },
      };
    },
    stream: ({ params }) => this.api.list(params.teamId, params.query),
  });
  protected readonly rows = computed<PresetDto[]>(() => (this.presets.hasValue() ? this.presets.value() : []));
  /** All thumbnails on one scale, so a deeper or longer tuck looks deeper or longer. */
  protected readonly scale = computed(() => shapeDomain(this.rows().map((r) => r.shape)));
  private readonly seenGenres = signal<string[]>([]);
  protected readonly genreOptions = computed(() => [...new Set([...suggestedGenres, ...this.seenGenres()])].sort());
  protected readonly errorMessage = computed(() => {
    const err = this.presets.error();
    return err ? toApiFailure(err).message : null;
  });

  constructor() {
    toObservable(this.searchText)
      .pipe(skip(1), debounceTime(250), distinctUntilChanged(), takeUntilDestroyed())
      .subscribe((text) => this.q.set(text.trim()));
    // Genres the team made up itself join the suggested ones in the filter.
    toObservable(this.rows)
      .pipe(takeUntilDestroyed())
      .subscribe((rows) => {
        const known = new Set(this.seenGenres());
        const added = rows.map((r) => r.genre).filter((g) => !known.has(g));
        if (added.length) this.seenGenres.set([...known, ...new Set(added)]);
      });
  }

  protected exportUrl(p: PresetDto): string {
    return this.api.exportUrl(p.teamId, p.id);
  }

  protected setView(view: 'table' | 'cards'): void {
    this.view.set(view);
    try {
      localStorage.setItem(viewKey, view);
    } catch {
      // Kept for this visit only.
    }
  }

  protected onSearch(event: Event): void {
    this.searchText.set((event.target as HTMLInputElement).value);
  }

  protected onSort(sort: Sort): void {
    const key = (presetSortKeys as readonly string[]).includes(sort.active) ? (sort.active as SortKey) : 'name';
    this.sort.set({ key, order: sort.direction === '' ? 'asc' : sort.direction });
  }

  protected create(): void {
    const team = this.team();
    if (!team) return;
    this.actions.openForm(team.id).pipe(takeUntilDestroyed(this.destroyRef)).subscribe(() => this.presets.reload());
  }

  protected edit(p: PresetDto): void {
    this.run(p, this.actions.openForm(p.teamId, p));
  }

  protected duplicate(p: PresetDto): void {
    this.run(p, this.actions.duplicate(p.teamId, p));
  }

  protected publish(p: PresetDto): void {
    this.run(p, this.actions.publish(p.teamId, p));
  }

  protected unpublish(p: PresetDto): void {
    this.run(p, this.actions.unpublish(p.teamId, p));
  }

  protected retire(p: PresetDto): void {
    this.run(p, this.actions.retire(p.teamId, p));
  }

  /** Reads the picked file, parses it here (a clear message for non-JSON), and lets the server validate the rest. */
  protected async importFile(event: Event): Promise<void> {
    const inputEl = event.target as HTMLInputElement;
    const file = inputEl.files?.[0];
    inputEl.value = '';
    const team = this.team();
    if (!file || !team) return;
    this.importError.set(null);
    let parsed: unknown;
    try {
      parsed = JSON.parse(await file.text());
    } catch {
      this.importError.set(`“${file.name}” is not a JSON file, so it cannot be a Tuckline preset file.`);
      return;
    }
    this.importing.set(true);
    this.api
      .import(team.id, parsed)
      .pipe(takeUntilDestroyed(this.destroyRef))
      .subscribe({
        next: (imported) => {
          this.importing.set(false);
          this.snackBar.open(`Imported ${imported.length} preset${imported.length === 1 ? '' : 's'} as drafts.`, undefined, { duration: 4000 });
          this.presets.reload();
        },
        error: (err: unknown) => {
          this.importing.set(false);
          // The server names the first problem (path and message); it imports all or nothing.
          this.importError.set(`Not imported: ${toApiFailure(err).message}`);
        },
      });
  }

  private run(p: PresetDto, action: Observable<PresetDto>): void {
    this.busyId.set(p.id);
    action.pipe(takeUntilDestroyed(this.destroyRef)).subscribe({
      next: () => this.presets.reload(),
      error: () => this.busyId.set(null),
      complete: () => this.busyId.set(null),
    });
  }
}

function readView(): 'table' | 'cards' {
  try {
    return localStorage.getItem(viewKey) === 'cards' ? 'cards' : 'table';
  } catch {
    return 'table';
  }
}
