import { DatePipe } from '@angular/common';
import { ChangeDetectionStrategy, Component, computed, inject, signal } from '@angular/core';
import { rxResource, takeUntilDestroyed, toObservable } from '@angular/core/rxjs-interop';
import { MatButtonModule } from '@angular/material/button';
import { MatDialog } from '@angular/material/dialog';
import { MatFormFieldModule } from '@angular/material/form-field';
import { MatInputModule } from '@angular/material/input';
import { MatPaginatorModule, PageEvent } from '@angular/material/paginator';
import { MatProgressBarModule } from '@angular/material/progress-bar';
import { MatSortModule, Sort } from '@angular/material/sort';
import { MatTableModule } from '@angular/material/table';
import { Router, RouterLink } from '@angular/router';
import { debounceTime, distinctUntilChanged, skip } from 'rxjs';
import { Song, SongListQuery, songSortKeys } from '../../../../shared/schemas/song';
import { SongsApi } from '../../core/api/songs-api';
import { AuthService } from '../../core/auth/auth.service';
import { toApiFailure } from '../../core/http/api-error';
import { Icon } from '../../ui/icon/icon';
import { SongFormDialog, SongFormDialogData } from '../song-form-dialog/song-form-dialog';

type SortKey = (typeof songSortKeys)[number];

@Component({
  selector: 'tl-songs-list',
  imports: [
    DatePipe,
    RouterLink,
    MatTableModule,
    MatSortModule,
    MatPaginatorModule,
    MatFormFieldModule,
    MatInputModule,
    MatButtonModule,
    MatProgressBarModule,
    Icon,
  ],
  templateUrl: './songs-list.html',
  styleUrl: './songs-list.scss',
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class SongsList {
  private readonly api = inject(SongsApi);
  private readonly auth = inject(AuthService);
  private readonly dialog = inject(MatDialog);
  private readonly router = inject(Router);

  protected readonly columns = ['title', 'artistAlias', 'bpm', 'timeSignature', 'stemCount', 'hitCount', 'updatedAt'];
  protected readonly filterText = signal('');
  private readonly q = signal('');
  protected readonly sort = signal<{ key: SortKey; order: 'asc' | 'desc' }>({ key: 'updatedAt', order: 'desc' });
  protected readonly page = signal({ index: 0, size: 25 });
  protected readonly team = this.auth.team;

  protected readonly songs = rxResource({
    params: () => {
      const team = this.team();
      if (!team) return undefined;
      const query: Partial<SongListQuery> = {
        q: this.q() || undefined,
        sort: this.sort().key,
        order: this.sort().order,
        page: this.page().index,
        pageSize: this.page().size,
      };
      return { teamId: team.id, query };
    },
    stream: ({ params }) => this.api.list(params.teamId, params.query),
  });

  protected readonly rows = computed<Song[]>(() => (this.songs.hasValue() ? this.songs.value().items : []));
  protected readonly total = computed(() => (this.songs.hasValue() ? this.songs.value().total : 0));
  protected readonly errorMessage = computed(() => {
    const err = this.songs.error();
    return err ? toApiFailure(err).message : null;
  });

  constructor() {
    // Typing filters on the server (q), a beat after the last keystroke.
    toObservable(this.filterText)
      .pipe(skip(1), debounceTime(250), distinctUntilChanged(), takeUntilDestroyed())
      .subscribe((text) => {
        if (text.trim() === this.q()) return;
        this.q.set(text.trim());
        this.page.update((p) => ({ ...p, index: 0 }));
      });
  }

  protected onFilter(event: Event): void {
    this.filterText.set((event.target as HTMLInputElement).value);
  }

  protected onSort(sort: Sort): void {
    const key = (songSortKeys as readonly string[]).includes(sort.active) ? (sort.active as SortKey) : 'updatedAt';
    this.sort.set({ key, order: sort.direction === '' ? 'desc' : sort.direction });
    this.page.update((p) => ({ ...p, index: 0 }));
  }

  protected onPage(event: PageEvent): void {
    this.page.set({ index: event.pageIndex, size: event.pageSize });
  }

  protected retry(): void {
    this.songs.reload();
  }

  protected newSong(): void {
    const team = this.team();
    if (!team) return;
    const data: SongFormDialogData = { teamId: team.id };
    this.dialog
      .open<SongFormDialog, SongFormDialogData, Song>(SongFormDialog, { data, width: '560px', autoFocus: 'first-tabbable' })
      .afterClosed()
      .subscribe((song) => {
        if (song) void this.router.navigate(['/songs', song.id]);
      });
  }
}
