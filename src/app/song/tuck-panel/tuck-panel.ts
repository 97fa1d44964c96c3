import { forkJoin } from 'rxjs';
import { LiveAnnouncer } from '@angular/cdk/a11y';
import { ChangeDetectionStrategy, Component, computed, inject, input, signal } from '@angular/core';
import { FormsModule } from '@angular/forms';
import { MatButtonModule } from '@angular/material/button';
import { MatDialog } from '@angular/material/dialog';
import { MatFormFieldModule } from '@angular/material/form-field';
import { MatInputModule } from '@angular/material/input';
import { MatSelectModule } from '@angular/material/select';
import { MatSlideToggleModule } from '@angular/material/slide-toggle';
import { MatTooltipModule } from '@angular/material/tooltip';
import { filter, switchMap } from 'rxjs';
import { LaneDto } from '../../../../shared/schemas/lane';
import { ConfirmDialog, ConfirmDialogData } from '../../ui/confirm-dialog/confirm-dialog';
import { LanePreset } from '../lane-preset/lane-preset';
import { TuckEditor } from '../tuck-editor/tuck-editor';
import { WorkspaceStore } from '../workspace/workspace-store';

/** The lanes of the song and the shape editor of the one picked. */
@Component({
  selector: 'tl-tuck-panel',
  imports: [FormsModule, MatButtonModule, MatFormFieldModule, MatInputModule, MatSelectModule, MatSlideToggleModule, MatTooltipModule, TuckEditor, LanePreset],
  templateUrl: './tuck-panel.html',
  styleUrl: './tuck-panel.scss',
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class TuckPanel {
  protected readonly store = inject(WorkspaceStore);
  private readonly dialog = inject(MatDialog);
  private readonly announcer = inject(LiveAnnouncer);

  readonly canEdit = input(true);

  protected readonly renaming = signal<string | null>(null);
  protected readonly saving = signal(false);
  protected readonly lane = this.store.selectedLane;
  protected readonly shape = this.store.selectedShape;
  protected readonly curve = computed(() => this.store.curves().find((c) => c.laneId === this.lane()?.id) ?? null);
  protected readonly dirty = computed(() => {
    const lane = this.lane();
    return lane ? this.store.dirtyLaneIds().includes(lane.id) : false;
  });

  protected pick(lane: LaneDto): void {
    this.store.selectedLaneId.set(lane.id);
  }

  protected addLane(): void {
    const n = this.store.lanes().length + 1;
    const bass = this.store.bassStems().find((s) => !this.store.lanes().some((l) => l.bassSlot === s.slot)) ?? this.store.bassStems()[0];
    this.store.addLane({ name: bass ? bass.slot : `Lane ${n}`, bassSlot: bass?.slot ?? null }).subscribe();
  }

  protected rename(lane: LaneDto, name: string): void {
    this.renaming.set(null);
    const trimmed = name.trim();
    if (trimmed && trimmed !== lane.name) this.store.patchLane(lane, { name: trimmed }).subscribe();
  }

  protected toggleMute(lane: LaneDto): void {
    this.store.patchLane(lane, { muted: !lane.muted }).subscribe();
  }

  protected setBass(lane: LaneDto, slot: string | null): void {
    this.store.patchLane(lane, { bassSlot: slot }).subscribe();
  }

  protected setNumber(lane: LaneDto, field: 'baseGainDb' | 'gateThresholdDbfs', value: number): void {
    if (Number.isFinite(value) && value !== lane[field]) this.store.patchLane(lane, { [field]: value }).subscribe();
  }

  protected setGate(lane: LaneDto, on: boolean): void {
    this.store.patchLane(lane, { gateEnabled: on }).subscribe();
  }

  /** Swaps a lane with its neighbour; the order is the lanes' stored positions. */
  protected move(lane: LaneDto, delta: -1 | 1): void {
    const list = this.store.lanes();
    const i = list.findIndex((l) => l.id === lane.id);
    const j = i + delta;
    if (i < 0 || j < 0 || j >= list.length) return;
    forkJoin([this.store.patchLane(list[i], { position: j }), this.store.patchLane(list[j], { position: i })]).subscribe(() =>
      this.store.lanes.update((lanes) => [...lanes].sort((a, b) => a.position - b.position)),
    );
  }

  protected remove(lane: LaneDto): void {
    const data: ConfirmDialogData = {
      title: `Remove the lane “${lane.name}”?`,
      message: 'Its tuck shape and settings go with it. Exports already made stay in the history.',
      confirmLabel: 'Remove lane',
    };
    this.dialog
      .open<ConfirmDialog, ConfirmDialogData, boolean>(ConfirmDialog, { data, width: '440px' })
      .afterClosed()
      .pipe(filter((ok) => ok === true), switchMap(() => this.store.removeLane(lane)))
      .subscribe();
  }

  protected save(): void {
    const lane = this.lane();
    if (!lane) return;
    this.saving.set(true);
    this.store.saveShape(lane).subscribe({
      next: () => {
        this.saving.set(false);
        void this.announcer.announce(`Tuck shape saved to ${lane.name}.`);
      },
      error: () => this.saving.set(false),
    });
  }

  protected discard(): void {
    const lane = this.lane();
    if (lane) this.store.discardShape(lane);
  }
}
