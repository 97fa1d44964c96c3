import { ChangeDetectionStrategy, Component, ElementRef, afterRenderEffect, computed, effect, input, output, signal, untracked, viewChild } from '@angular/core';
import { FormsModule } from '@angular/forms';
import { MatButtonModule } from '@angular/material/button';
import { MatCheckboxModule } from '@angular/material/checkbox';
import { MatFormFieldModule } from '@angular/material/form-field';
import { MatInputModule } from '@angular/material/input';
import { MatPaginator, MatPaginatorModule } from '@angular/material/paginator';
import { MatSelectModule } from '@angular/material/select';
import { MatSlideToggleModule } from '@angular/material/slide-toggle';
import { MatSort, MatSortModule } from '@angular/material/sort';
import { MatTableDataSource, MatTableModule } from '@angular/material/table';
import { formatBarBeatTick, secondsToBarBeatTick } from '../../../../shared/formats/bar-beat';
import { HitFilter, HitView, matchesFilter } from '../workspace/hit-views';

export interface HitChange {
  ids: string[];
  enabled?: boolean;
  depthDb?: number | null;
}

const statusWords = { tucked: 'Tucked', off: 'Off', gated: 'Skipped (bass gate)' } as const;

/** Every hit with its numbers; sort, filter, page, and turn many on or off at once. */
@Component({
  selector: 'tl-hit-table',
  imports: [FormsModule, MatTableModule, MatSortModule, MatPaginatorModule, MatCheckboxModule, MatSlideToggleModule, MatSelectModule, MatFormFieldModule, MatInputModule, MatButtonModule],
  templateUrl: './hit-table.html',
  styleUrl: './hit-table.scss',
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class HitTable {
  readonly hits = input.required<HitView[]>();
  readonly bpm = input.required<number>();
  readonly beats = input(4);
  readonly beatUnit = input(4);
  readonly selectedHit = input<number | null>(null);
  readonly canEdit = input(true);
  readonly change = output<HitChange>();
  readonly selectHit = output<number>();

  private readonly sort = viewChild.required(MatSort);
  private readonly paginator = viewChild.required(MatPaginator);
  private readonly host = viewChild.required<ElementRef<HTMLElement>>('wrap');

  protected readonly columns = ['pick', 'number', 'time', 'position', 'strength', 'enabled', 'depth', 'status'];
  protected readonly filterKind = signal<HitFilter['kind']>('all');
  protected readonly strengthBelow = signal(50);
  protected readonly picked = signal<ReadonlySet<string>>(new Set());
  protected readonly data = new MatTableDataSource<HitView>([]);

  private readonly filter = computed<HitFilter>(() => {
    const kind = this.filterKind();
    return kind === 'weaker' ? { kind, below: this.strengthBelow() / 100 } : ({ kind } as HitFilter);
  });
  protected readonly filtered = computed(() => this.hits().filter((h) => matchesFilter(h, this.filter())));
  protected readonly pickedCount = computed(() => this.picked().size);
  protected readonly allPicked = computed(() => this.filtered().length > 0 && this.filtered().every((h) => this.picked().has(h.id)));

  constructor() {
    this.data.sortingDataAccessor = (h, col) => {
      switch (col) {
        case 'number': case 'time': case 'position': return h.timeSec;
        case 'strength': return h.strength;
        case 'enabled': return h.enabled ? 1 : 0;
        case 'depth': return h.depthDb ?? 1;
        case 'status': return h.status;
        default: return h.number;
      }
    };
    effect(() => {
      this.data.data = this.filtered();
    });
    afterRenderEffect(() => {
      if (!this.data.sort) this.data.sort = this.sort();
      if (!this.data.paginator) this.data.paginator = this.paginator();
    });
    // A hit picked on the timeline: show its page of the table.
    effect(() => {
      const i = this.selectedHit();
      if (i === null) return;
      untracked(() => {
        const sorted = this.data.sortData(this.data.filteredData.slice(), this.sort());
        const pos = sorted.findIndex((h) => h.index === i);
        const p = this.paginator();
        if (pos >= 0 && Math.floor(pos / p.pageSize) !== p.pageIndex) {
          p.pageIndex = Math.floor(pos / p.pageSize);
          this.data.paginator = p;
        }
        queueMicrotask(() => this.host().nativeElement.querySelector('tr.selected')?.scrollIntoView({ block: 'nearest' }));
      });
    });
  }

  protected statusText(h: HitView): string {
    return statusWords[h.status];
  }

  protected position(h: HitView): string {
    return formatBarBeatTick(secondsToBarBeatTick(h.timeSec, this.bpm(), [this.beats(), this.beatUnit()], 960));
  }

  protected togglePick(h: HitView, on: boolean): void {
    this.picked.update((s) => {
      const next = new Set(s);
      if (on) next.add(h.id);
      else next.delete(h.id);
      return next;
    });
  }

  protected pickAll(on: boolean): void {
    this.picked.set(on ? new Set(this.filtered().map((h) => h.id)) : new Set());
  }

  protected bulk(enabled: boolean): void {
    const ids = [...this.picked()];
    if (ids.length) this.change.emit({ ids, enabled });
    this.picked.set(new Set());
  }

  protected setEnabled(h: HitView, enabled: boolean): void {
    this.change.emit({ ids: [h.id], enabled });
  }

  protected setDepth(h: HitView, raw: string): void {
    const text = raw.trim();
    if (text === '') {
      if (h.depthDb !== null) this.change.emit({ ids: [h.id], depthDb: null });
      return;
    }
    const v = Number(text.replace('−', '-'));
    if (!Number.isFinite(v)) return;
    const depth = Math.max(-120, Math.min(0, -Math.abs(v)));
    if (depth !== h.depthDb) this.change.emit({ ids: [h.id], depthDb: depth });
  }
}
