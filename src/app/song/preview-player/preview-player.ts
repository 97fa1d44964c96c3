import { ChangeDetectionStrategy, Component, DestroyRef, computed, inject, signal } from '@angular/core';
import { takeUntilDestroyed } from '@angular/core/rxjs-interop';
import { MatButtonModule } from '@angular/material/button';
import { MatButtonToggleModule } from '@angular/material/button-toggle';
import { MatCheckboxModule } from '@angular/material/checkbox';
import { MatProgressBarModule } from '@angular/material/progress-bar';
import { MatSliderModule } from '@angular/material/slider';
import { forkJoin, from, of, switchMap } from 'rxjs';
import { sampleGainCurve } from '../../../../shared/dsp/gain';
import { ReportApi } from '../../core/api/report-api';
import { toApiFailure } from '../../core/http/api-error';
import { WorkspaceStore } from '../workspace/workspace-store';
import { MAX_LEVEL_DB, PreviewGraph, START_LEVEL_DB, tuckedCopy, type PreviewLane } from './preview-graph';

type LoopMode = 'song' | 'hit';

/**
 * A/B preview of kick plus bass with the tucks on or off. It starts quiet, says
 * why, and every sound passes a safety limiter (preview-graph.ts).
 */
@Component({
  selector: 'tl-preview-player',
  imports: [MatButtonModule, MatButtonToggleModule, MatCheckboxModule, MatProgressBarModule, MatSliderModule],
  templateUrl: './preview-player.html',
  styleUrl: './preview-player.scss',
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class PreviewPlayer {
  protected readonly store = inject(WorkspaceStore);
  private readonly api = inject(ReportApi);
  private readonly destroyRef = inject(DestroyRef);

  protected readonly startLevelDb = START_LEVEL_DB;
  protected readonly maxLevelDb = MAX_LEVEL_DB;
  protected readonly loading = signal(false);
  protected readonly error = signal<string | null>(null);
  protected readonly ready = signal(false);
  protected readonly playing = signal(false);
  protected readonly tucksOn = signal(true);
  protected readonly levelDb = signal(START_LEVEL_DB);
  protected readonly loopMode = signal<LoopMode>('song');
  protected readonly positionSec = signal(0);
  protected readonly muted = signal<Record<string, boolean>>({});
  protected readonly solo = signal<string | null>(null);

  protected readonly lanes = computed(() => this.store.lanes().filter((l) => this.store.bassStemFor(l)?.format === 'wav'));
  protected readonly selectedHitTime = computed(() => {
    const i = this.store.selectedHit();
    return i == null ? null : this.store.hitMap()?.hits[i]?.timeSec ?? null;
  });

  private graph: PreviewGraph | null = null;
  private frame = 0;

  constructor() {
    this.destroyRef.onDestroy(() => {
      cancelAnimationFrame(this.frame);
      this.graph?.dispose();
    });
  }

  /** Fetches and decodes the stems, builds each lane's tucked copy from its live (draft) curve. */
  protected load(): void {
    const song = this.store.song();
    const kick = this.store.kickAudio();
    if (!song) return;
    this.loading.set(true);
    this.error.set(null);
    const context = new AudioContext();
    const decode = (stemId: string) => this.api.stemFile(song.teamId, song.id, stemId).pipe(switchMap((bytes) => from(context.decodeAudioData(bytes))));
    const lanes = this.lanes();
    forkJoin({
      kick: kick ? decode(kick.id) : of(null),
      basses: lanes.length ? forkJoin(lanes.map((l) => decode(this.store.bassStemFor(l)!.id))) : of([] as AudioBuffer[]),
    })
      .pipe(takeUntilDestroyed(this.destroyRef))
      .subscribe({
        next: ({ kick: kickBuffer, basses }) => {
          const previewLanes: PreviewLane[] = basses.map((buffer, i) => {
            const curve = this.store.curves().find((c) => c.laneId === lanes[i].id);
            const gains = curve ? sampleGainCurve({ points: curve.points, baseGainDb: curve.baseGainDb }, buffer.length, buffer.sampleRate) : new Float32Array(0);
            return { id: lanes[i].id, original: buffer, tucked: tuckedCopy(context, buffer, gains) };
          });
          this.graph?.dispose();
          this.graph = new PreviewGraph(context, kickBuffer, previewLanes);
          this.graph.setLevelDb(this.levelDb());
          this.graph.setTucks(this.tucksOn());
          this.ready.set(true);
          this.loading.set(false);
        },
        error: (e: unknown) => {
          void context.close();
          this.error.set(e instanceof DOMException ? 'The browser could not decode a stem for playback.' : toApiFailure(e).message);
          this.loading.set(false);
        },
      });
  }

  protected toggle(): void {
    const g = this.graph;
    if (!g) return;
    if (g.playing) {
      g.pause();
      this.playing.set(false);
      cancelAnimationFrame(this.frame);
      return;
    }
    this.applyLoop();
    g.play(this.loopMode() === 'hit' && this.selectedHitTime() != null ? Math.max(0, this.selectedHitTime()! - 0.25) : this.positionSec(), (id) => this.audible(id));
    this.playing.set(true);
    const tick = () => {
      this.positionSec.set(g.positionSec());
      if (g.playing && g.positionSec() < g.durationSec) this.frame = requestAnimationFrame(tick);
      else this.playing.set(false);
    };
    this.frame = requestAnimationFrame(tick);
  }

  protected setTucks(on: boolean): void {
    this.tucksOn.set(on);
    this.graph?.setTucks(on);
  }

  protected setLevel(db: number): void {
    this.levelDb.set(db);
    this.graph?.setLevelDb(db);
  }

  protected setLoop(mode: LoopMode): void {
    this.loopMode.set(mode);
    this.applyLoop();
  }

  protected toggleMute(laneId: string): void {
    this.muted.update((m) => ({ ...m, [laneId]: !m[laneId] }));
    this.graph?.setLaneLevels((id) => this.audible(id));
  }

  protected toggleSolo(laneId: string): void {
    this.solo.update((s) => (s === laneId ? null : laneId));
    this.graph?.setLaneLevels((id) => this.audible(id));
  }

  protected audible(laneId: string): boolean {
    const solo = this.solo();
    return solo ? solo === laneId : !this.muted()[laneId];
  }

  private applyLoop(): void {
    const t = this.selectedHitTime();
    this.graph?.setLoop(this.loopMode() === 'hit' && t != null ? { fromSec: Math.max(0, t - 0.25), toSec: t + 0.5 } : null);
  }

  protected formatTime(sec: number): string {
    const m = Math.floor(sec / 60);
    return `${m}:${(sec - m * 60).toFixed(2).padStart(5, '0')}`;
  }
}
