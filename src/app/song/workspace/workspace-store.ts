import { Injectable, computed, inject, signal } from '@angular/core';
import { Observable, catchError, forkJoin, of, tap } from 'rxjs';
import { bassSilenceTest, type BassActivityLevels } from '../../../../shared/dsp/bass-gate';
import { stampHits } from '../../../../shared/dsp/stamp';
import { ExportDto, ExportRequest } from '../../../../shared/schemas/export-request';
import { HitEdit, HitMapDto, DetectRequest } from '../../../../shared/schemas/hit-map';
import { LaneCreate, LaneDto, LanePatch } from '../../../../shared/schemas/lane';
import { Song } from '../../../../shared/schemas/song';
import { Stem, StemOverview } from '../../../../shared/schemas/stem';
import { TuckShape } from '../../../../shared/schemas/tuck-shape';
import { WorkspaceApi } from '../../core/api/workspace-api';
import { EditHistory } from '../tuck-editor/edit-history';
import { ShapeEdit } from '../tuck-editor/tuck-editor';
import { HitView, diffHitMaps, hitViews, toEngineHits } from './hit-views';
import { averagedKickEnvelope } from './kick-envelope';

export interface LaneCurveView {
  laneId: string;
  name: string;
  muted: boolean;
  points: { timeSec: number; gainDb: number }[];
  baseGainDb: number;
  floorDb: number;
  gatedHitIndexes: number[];
  stampedHitCount: number;
}

/**
 * The state of one open song: stems, hit map, lanes with their draft shapes
 * (unsaved edits, with undo and redo), and every lane's gain curve re-stamped
 * in the browser with the shared engine whenever a shape or a hit changes.
 */
@Injectable()
export class WorkspaceStore {
  private readonly api = inject(WorkspaceApi);

  private readonly ids = signal<{ teamId: string; songId: string } | null>(null);
  readonly song = signal<Song | null>(null);
  readonly stems = signal<Stem[]>([]);
  readonly hitMap = signal<HitMapDto | null>(null);
  readonly lanes = signal<LaneDto[]>([]);
  readonly exports = signal<ExportDto[]>([]);
  readonly loading = signal(false);
  readonly detecting = signal(false);
  /** The headroom report has been measured for the song as it is now (the Check step sets it). */
  readonly checked = signal(false);

  private readonly overviews = signal<Record<string, StemOverview>>({});
  private readonly activities = signal<Record<string, BassActivityLevels>>({});
  private readonly drafts = signal<Record<string, TuckShape>>({});
  private readonly histories = new Map<string, EditHistory<TuckShape>>();
  private readonly historyTick = signal(0);

  /** Hit maps before each hit edit (undo) and after each undone one (redo). */
  private readonly hitUndo = signal<HitMapDto[]>([]);
  private readonly hitRedo = signal<HitMapDto[]>([]);
  readonly canUndoHits = computed(() => this.hitUndo().length > 0);
  readonly canRedoHits = computed(() => this.hitRedo().length > 0);

  readonly selectedLaneId = signal<string | null>(null);
  readonly selectedHit = signal<number | null>(null);

  readonly currentStems = computed(() => this.stems().filter((s) => s.isCurrent));
  readonly kickStem = computed(() => this.currentStems().find((s) => s.role === 'kick') ?? null);
  readonly kickAudio = computed(() => this.currentStems().find((s) => s.role === 'kick' && s.format === 'wav') ?? null);
  readonly bassStems = computed(() => this.currentStems().filter((s) => s.role === 'bass'));
  readonly durationSec = computed(() => Math.max(1, ...this.currentStems().map((s) => s.durationSec)));

  readonly selectedLane = computed(() => this.lanes().find((l) => l.id === this.selectedLaneId()) ?? this.lanes()[0] ?? null);
  readonly shapeOf = (lane: LaneDto): TuckShape => this.drafts()[lane.id] ?? lane.shape;
  readonly selectedShape = computed(() => {
    const lane = this.selectedLane();
    return lane ? this.shapeOf(lane) : null;
  });
  readonly dirtyLaneIds = computed(() => Object.keys(this.drafts()));
  readonly hasUnsavedEdits = computed(() => this.dirtyLaneIds().length > 0);
  readonly canUndo = computed(() => (this.historyTick(), this.historyFor(this.selectedLane())?.canUndo ?? false));
  readonly canRedo = computed(() => (this.historyTick(), this.historyFor(this.selectedLane())?.canRedo ?? false));

  readonly kickOverview = computed(() => {
    const s = this.kickAudio();
    return s ? this.overviews()[s.id] ?? null : null;
  });
  readonly bassOverview = computed(() => {
    const s = this.bassStemFor(this.selectedLane());
    return s ? this.overviews()[s.id] ?? null : null;
  });

  /** The kick averaged over its enabled hits, drawn behind the tuck shape. */
  readonly kickEnvelope = computed(() => {
    const ov = this.kickOverview();
    const times = (this.hitMap()?.hits ?? []).filter((h) => h.enabled).map((h) => h.timeSec);
    return ov ? averagedKickEnvelope(ov, times) : null;
  });

  private readonly engineHits = computed(() => toEngineHits(this.hitMap()?.hits ?? []));

  /** Every lane stamped from its (draft) shape: the live gain curves. */
  readonly curves = computed<LaneCurveView[]>(() => {
    const hits = this.engineHits();
    const durationSec = this.durationSec();
    return this.lanes().map((lane) => {
      const shape = this.shapeOf(lane);
      const bass = this.bassStemFor(lane);
      const activity = bass ? this.activities()[bass.id] : undefined;
      const result = stampHits(hits, shape, {
        durationSec,
        baseGainDb: lane.baseGainDb,
        isBassSilent: lane.gateEnabled && activity ? bassSilenceTest(activity, lane.gateThresholdDbfs) : undefined,
      });
      return {
        laneId: lane.id,
        name: lane.name,
        muted: lane.muted,
        points: result.curve.points,
        baseGainDb: lane.baseGainDb,
        floorDb: result.curve.floorDb ?? shape.floorDb,
        gatedHitIndexes: result.gatedHitIndexes,
        stampedHitCount: result.stampedHitCount,
      };
    });
  });

  readonly hits = computed<HitView[]>(() => {
    const lane = this.selectedLane();
    const curve = this.curves().find((c) => c.laneId === lane?.id);
    return hitViews(this.hitMap()?.hits ?? [], curve?.gatedHitIndexes ?? []);
  });

  // ---- loading

  load(teamId: string, song: Song): Observable<unknown> {
    this.ids.set({ teamId, songId: song.id });
    this.song.set(song);
    this.loading.set(true);
    return forkJoin({
      stems: this.api.stems(teamId, song.id),
      hitMap: this.api.hitMap(teamId, song.id).pipe(catchError(() => of(null))),
      lanes: this.api.lanes(teamId, song.id),
      exports: this.api.exports(teamId, song.id),
    }).pipe(
      tap(({ stems, hitMap, lanes, exports }) => {
        this.stems.set(stems);
        this.hitMap.set(hitMap);
        this.lanes.set(lanes);
        this.exports.set(exports);
        this.loading.set(false);
        this.fetchAudioViews();
      }),
      catchError((err: unknown) => {
        this.loading.set(false);
        throw err;
      }),
    );
  }

  /** Overviews for the kick and every bass stem, activity for the bass gate; each fetched once. */
  private fetchAudioViews(): void {
    const ids = this.ids();
    if (!ids) return;
    for (const stem of this.currentStems()) {
      if (stem.format !== 'wav' || stem.role === 'other') continue;
      if (!this.overviews()[stem.id]) {
        this.api.overview(ids.teamId, ids.songId, stem.id).subscribe({
          next: (o) => this.overviews.update((m) => ({ ...m, [stem.id]: o })),
          error: () => undefined, // the interceptor told the user; the lane draws without its waveform
        });
      }
      if (stem.role === 'bass' && !this.activities()[stem.id]) {
        this.api.activity(ids.teamId, ids.songId, stem.id).subscribe({
          next: (a) => this.activities.update((m) => ({ ...m, [stem.id]: a })),
          error: () => undefined,
        });
      }
    }
  }

  bassStemFor(lane: LaneDto | null): Stem | null {
    const bass = this.bassStems();
    if (!lane) return bass[0] ?? null;
    return bass.find((s) => s.slot === lane.bassSlot) ?? bass[0] ?? null;
  }

  // ---- stems

  stemUploaded(stem: Stem, hitMap?: HitMapDto): void {
    this.stems.update((list) => [stem, ...list.map((s) => (s.slot === stem.slot ? { ...s, isCurrent: false } : s))]);
    if (hitMap) this.hitMap.set(hitMap);
    this.song.update((s) => (s ? { ...s, stemCount: s.stemCount + 1, hitCount: hitMap ? hitMap.hits.length : s.hitCount } : s));
    this.fetchAudioViews();
  }

  restore(stem: Stem): Observable<unknown> {
    const ids = this.requireIds();
    return this.api.restoreStem(ids.teamId, ids.songId, stem.id).pipe(
      tap((res) => {
        this.stems.update((list) => list.map((s) => (s.slot === stem.slot ? { ...s, isCurrent: s.id === res.stem.id } : s)));
        if (res.hitMap) this.hitMap.set(res.hitMap);
        this.fetchAudioViews();
      }),
    );
  }

  // ---- hits

  detect(request: DetectRequest = {}): Observable<HitMapDto> {
    const ids = this.requireIds();
    this.detecting.set(true);
    return this.api.detect(ids.teamId, ids.songId, request).pipe(
      tap({
        next: (map) => {
          this.hitMap.set(map);
          this.hitUndo.set([]);
          this.hitRedo.set([]);
          this.song.update((s) => (s ? { ...s, hitCount: map.hits.length } : s));
          this.detecting.set(false);
        },
        error: () => this.detecting.set(false),
      }),
    );
  }

  editHits(edit: HitEdit): Observable<HitMapDto> {
    const ids = this.requireIds();
    const before = this.hitMap();
    return this.api.editHits(ids.teamId, ids.songId, edit).pipe(
      tap((map) => {
        if (before) this.hitUndo.update((s) => [...s.slice(-99), before]);
        this.hitRedo.set([]);
        this.hitMap.set(map);
      }),
    );
  }

  /** Undoes the last hit edit by sending the edit that restores the map before it. */
  undoHits(): Observable<HitMapDto> | null {
    return this.stepHits(this.hitUndo, this.hitRedo);
  }

  redoHits(): Observable<HitMapDto> | null {
    return this.stepHits(this.hitRedo, this.hitUndo);
  }

  private stepHits(from: ReturnType<typeof signal<HitMapDto[]>>, to: ReturnType<typeof signal<HitMapDto[]>>): Observable<HitMapDto> | null {
    const current = this.hitMap();
    const target = from().at(-1);
    if (!current || !target) return null;
    from.update((s) => s.slice(0, -1));
    const edit = diffHitMaps(current.hits, target.hits);
    if (!edit) return null;
    const ids = this.requireIds();
    return this.api.editHits(ids.teamId, ids.songId, edit).pipe(
      tap((map) => {
        to.update((s) => [...s, current]);
        this.hitMap.set(map);
      }),
    );
  }

  toggleHit(index: number): Observable<HitMapDto> | null {
    const hit = this.hitMap()?.hits[index];
    return hit ? this.editHits({ update: [{ id: hit.id, enabled: !hit.enabled }] }) : null;
  }

  acknowledgeRevision(): Observable<HitMapDto> {
    const ids = this.requireIds();
    return this.api.acknowledge(ids.teamId, ids.songId).pipe(tap((map) => this.hitMap.set(map)));
  }

  // ---- lanes and shapes

  private historyFor(lane: LaneDto | null): EditHistory<TuckShape> | null {
    if (!lane) return null;
    let h = this.histories.get(lane.id);
    if (!h) {
      h = new EditHistory(lane.shape);
      this.histories.set(lane.id, h);
    }
    return h;
  }

  editShape(edit: ShapeEdit): void {
    const lane = this.selectedLane();
    const history = this.historyFor(lane);
    if (!lane || !history) return;
    history.push(edit.shape, edit.mergeKey);
    this.setDraft(lane, edit.shape);
  }

  undo(): void {
    const lane = this.selectedLane();
    const h = this.historyFor(lane);
    if (lane && h?.canUndo) this.setDraft(lane, h.undo());
  }

  redo(): void {
    const lane = this.selectedLane();
    const h = this.historyFor(lane);
    if (lane && h?.canRedo) this.setDraft(lane, h.redo());
  }

  private setDraft(lane: LaneDto, shape: TuckShape): void {
    this.drafts.update((d) => {
      const next = { ...d };
      if (shape === lane.shape) delete next[lane.id];
      else next[lane.id] = shape;
      return next;
    });
    this.historyTick.update((n) => n + 1);
  }

  saveShape(lane: LaneDto): Observable<LaneDto> {
    const shape = this.drafts()[lane.id];
    return this.patchLane(lane, { shape: shape ?? lane.shape }).pipe(
      tap((saved) => {
        this.drafts.update((d) => {
          const next = { ...d };
          delete next[lane.id];
          return next;
        });
        this.historyFor(saved)?.reset(saved.shape);
        this.historyTick.update((n) => n + 1);
      }),
    );
  }

  /** Drops every unsaved edit (the song is going away). */
  discardAll(): void {
    for (const lane of this.lanes()) this.discardShape(lane);
  }

  discardShape(lane: LaneDto): void {
    this.historyFor(lane)?.reset(lane.shape);
    this.setDraft(lane, lane.shape);
  }

  patchLane(lane: LaneDto, patch: LanePatch): Observable<LaneDto> {
    const ids = this.requireIds();
    return this.api.patchLane(ids.teamId, ids.songId, lane.id, { ...patch, revision: lane.revision }).pipe(
      tap((saved) => {
        this.lanes.update((list) => list.map((l) => (l.id === saved.id ? saved : l)));
        // The history's base is the stored shape; keep it when only other fields changed.
        if (!patch.shape) this.histories.get(saved.id)?.seal();
      }),
    );
  }

  addLane(lane: LaneCreate): Observable<LaneDto> {
    const ids = this.requireIds();
    return this.api.createLane(ids.teamId, ids.songId, lane).pipe(
      tap((created) => {
        this.lanes.update((list) => [...list, created]);
        this.selectedLaneId.set(created.id);
      }),
    );
  }

  removeLane(lane: LaneDto): Observable<void> {
    const ids = this.requireIds();
    return this.api.removeLane(ids.teamId, ids.songId, lane.id).pipe(
      tap(() => {
        this.lanes.update((list) => list.filter((l) => l.id !== lane.id));
        this.histories.delete(lane.id);
        this.drafts.update((d) => {
          const next = { ...d };
          delete next[lane.id];
          return next;
        });
        if (this.selectedLaneId() === lane.id) this.selectedLaneId.set(null);
      }),
    );
  }

  // ---- exports

  createExport(request: ExportRequest): Observable<ExportDto> {
    const ids = this.requireIds();
    return this.api.createExport(ids.teamId, ids.songId, request).pipe(tap((e) => this.exports.update((list) => [e, ...list])));
  }

  exportUrl(exp: ExportDto): string {
    const ids = this.requireIds();
    return this.api.exportFileUrl(ids.teamId, ids.songId, exp.id);
  }

  teamAndSong(): { teamId: string; songId: string } {
    return this.requireIds();
  }

  private requireIds(): { teamId: string; songId: string } {
    const ids = this.ids();
    if (!ids) throw new Error('The workspace has no song loaded.');
    return ids;
  }
}
