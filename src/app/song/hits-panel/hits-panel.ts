import type { DetectRequest } from '../../../../shared/schemas/hit-map';
import { ChangeDetectionStrategy, Component, DestroyRef, computed, inject, input, signal } from '@angular/core';
import { takeUntilDestroyed } from '@angular/core/rxjs-interop';
import { FormsModule } from '@angular/forms';
import { MatButtonModule } from '@angular/material/button';
import { MatExpansionModule } from '@angular/material/expansion';
import { MatFormFieldModule } from '@angular/material/form-field';
import { MatInputModule } from '@angular/material/input';
import { MatProgressBarModule } from '@angular/material/progress-bar';
import { MatSliderModule } from '@angular/material/slider';
import { Subscription } from 'rxjs';
import { midiKickOptionsSchema, detectionOptionsSchema } from '../../../../shared/schemas/hit';
import { HitChange, HitTable } from '../hit-table/hit-table';
import { WorkspaceStore } from '../workspace/workspace-store';

/** Detection, the hit table, and the edits a range or a pick of hits needs. */
@Component({
  selector: 'tl-hits-panel',
  imports: [FormsModule, MatButtonModule, MatExpansionModule, MatFormFieldModule, MatInputModule, MatProgressBarModule, MatSliderModule, HitTable],
  templateUrl: './hits-panel.html',
  styleUrl: './hits-panel.scss',
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class HitsPanel {
  protected readonly store = inject(WorkspaceStore);
  private readonly destroyRef = inject(DestroyRef);
  private detection: Subscription | null = null;

  readonly canEdit = input(true);

  protected readonly sensitivity = signal(0.5);
  protected readonly minGapMs = signal(50);
  protected readonly lowBandHz = signal(120);
  protected readonly addAtSec = signal<number | null>(null);
  protected readonly song = this.store.song;
  protected readonly summary = computed(() => this.store.hitMap()?.revisionSummary ?? null);
  protected readonly hasKick = computed(() => this.store.kickStem() !== null);

  /** A MIDI kick part: detection reads its notes, so the options are which notes and which channel. */
  protected readonly isMidiKick = computed(() => this.store.kickStem()?.format === 'midi');
  protected readonly midiNotes = signal('35, 36');
  protected readonly midiChannel = signal<number | null>(10);
  protected readonly midiError = signal<string | null>(null);

  protected detect(): void {
    if (this.isMidiKick()) {
      const notes = this.midiNotes().split(/[\s,]+/).filter(Boolean).map(Number);
      const parsed = midiKickOptionsSchema.safeParse({ notes, channel: this.midiChannel() || null });
      if (!parsed.success) {
        this.midiError.set('Kick notes are MIDI note numbers 0–127, and the channel 1–16 or empty.');
        return;
      }
      this.midiError.set(null);
      this.run({ midi: parsed.data });
      return;
    }
    const parsed = detectionOptionsSchema.safeParse({ sensitivity: this.sensitivity(), minGapMs: this.minGapMs(), lowBandHz: this.lowBandHz() });
    if (!parsed.success) return;
    this.run({ detection: parsed.data });
  }

  private run(request: DetectRequest): void {
    this.detection = this.store.detect(request).pipe(takeUntilDestroyed(this.destroyRef)).subscribe({
      next: () => (this.detection = null),
      error: () => (this.detection = null),
    });
  }

  protected cancelDetect(): void {
    this.detection?.unsubscribe();
    this.detection = null;
    this.store.detecting.set(false);
  }

  protected onChange(change: HitChange): void {
    this.store.editHits({ update: change.ids.map((id) => ({ id, enabled: change.enabled, depthDb: change.depthDb })) }).subscribe();
  }

  protected addHit(): void {
    const t = this.addAtSec();
    if (t === null || !Number.isFinite(t) || t < 0) return;
    this.store.editHits({ add: [{ timeSec: t, strength: 1 }] }).subscribe(() => this.addAtSec.set(null));
  }

  protected undoHits(): void {
    this.store.undoHits()?.subscribe();
  }

  protected redoHits(): void {
    this.store.redoHits()?.subscribe();
  }

  protected acknowledge(): void {
    this.store.acknowledgeRevision().subscribe();
  }
}
