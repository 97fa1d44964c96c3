import { ChangeDetectionStrategy, Component, ElementRef, afterRenderEffect, computed, effect, input, output, signal, untracked, viewChild } from '@angular/core';
import { MatButtonModule } from '@angular/material/button';
import { MatTooltipModule } from '@angular/material/tooltip';
import * as d3 from 'd3';
import { StemOverview } from '../../../../shared/schemas/stem';
import { HitView } from '../workspace/hit-views';
import { LaneCurveView } from '../workspace/workspace-store';
import { TimeView, centreOn, panView, pickLevel, rulerTicks, zoomView } from './timeline-math';

const rows = { ruler: 22, kick: 66, gap: 6, bass: 104, overview: 20 };
const left = 64;

/**
 * The song at a glance and up close: kick and bass waveforms from the
 * server's overviews, hit markers, each lane's gain curve, a bar.beat ruler.
 * Wheel zooms (Shift+wheel pans), drag pans, Shift+drag selects a range;
 * keys: + − zoom, ← → pan, 0 fits, , . pick the previous or next hit, Space toggles it.
 */
@Component({
  selector: 'tl-timeline',
  imports: [MatButtonModule, MatTooltipModule],
  templateUrl: './timeline.html',
  styleUrl: './timeline.scss',
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class Timeline {
  readonly durationSec = input.required<number>();
  readonly bpm = input.required<number>();
  readonly beats = input(4);
  readonly beatUnit = input(4);
  readonly kick = input<StemOverview | null>(null);
  readonly bass = input<StemOverview | null>(null);
  readonly hits = input<HitView[]>([]);
  readonly curves = input<LaneCurveView[]>([]);
  readonly selectedLaneId = input<string | null>(null);
  readonly selectedHit = input<number | null>(null);
  /** What a new kick revision changed (until acknowledged): drawn as small labelled flags above the kick row. */
  readonly revision = input<{ added: number[]; removed: number[]; moved: [number, number][] } | null>(null);

  readonly selectHit = output<number>();
  readonly toggleHit = output<number>();
  readonly rangeSelect = output<{ fromSec: number; toSec: number }>();

  private readonly svgRef = viewChild.required<ElementRef<SVGSVGElement>>('svg');
  protected readonly width = signal(900);
  protected readonly view = signal<TimeView>({ t0: 0, t1: 1 });
  protected readonly range = signal<{ fromSec: number; toSec: number } | null>(null);
  protected readonly height = rows.ruler + rows.kick + rows.gap + rows.bass + rows.gap + rows.overview;
  /** The gesture in progress; kept on the instance because every redraw re-binds the handlers. */
  private drag: { startX: number; startView: TimeView; mode: 'pan' | 'range' | 'overview'; moved: boolean } | null = null;
  protected readonly viewLabel = computed(() => {
    const { t0, t1 } = this.view();
    const digits = t1 - t0 < 1 ? 3 : 2;
    return `${t0.toFixed(digits)} s – ${t1.toFixed(digits)} s`;
  });

  constructor() {
    // A new song length shows the whole song.
    effect(() => {
      const d = this.durationSec();
      untracked(() => this.view.set({ t0: 0, t1: d }));
    });
    // Selecting a hit elsewhere (the table) brings it into view.
    effect(() => {
      const i = this.selectedHit();
      const hit = i === null ? undefined : this.hits()[i];
      if (!hit) return;
      untracked(() => {
        const v = this.view();
        if (hit.timeSec < v.t0 || hit.timeSec > v.t1) this.view.set(centreOn(v, hit.timeSec, this.durationSec()));
      });
    });
    afterRenderEffect(() => this.render());
    afterRenderEffect((onCleanup) => {
      const el = this.svgRef().nativeElement.parentElement!;
      const ro = new ResizeObserver(([e]) => this.width.set(Math.max(360, Math.floor(e.contentRect.width))));
      ro.observe(el);
      onCleanup(() => ro.disconnect());
    });
  }

  protected zoom(factor: number): void {
    const v = this.view();
    this.view.set(zoomView(v, factor, (v.t0 + v.t1) / 2, this.durationSec()));
  }

  protected fit(): void {
    this.view.set({ t0: 0, t1: this.durationSec() });
  }

  protected clearRange(): void {
    this.range.set(null);
  }

  protected onKey(e: KeyboardEvent): void {
    const v = this.view();
    const span = v.t1 - v.t0;
    const d = this.durationSec();
    const hits = this.hits();
    const sel = this.selectedHit();
    switch (e.key) {
      case '+': case '=': this.zoom(0.5); break;
      case '-': case '_': this.zoom(2); break;
      case 'ArrowLeft': this.view.set(panView(v, -span * (e.shiftKey ? 0.02 : 0.2), d)); break;
      case 'ArrowRight': this.view.set(panView(v, span * (e.shiftKey ? 0.02 : 0.2), d)); break;
      case '0': case 'Home': this.fit(); break;
      case ',': if (hits.length) this.selectHit.emit(Math.max(0, (sel ?? 1) - 1)); break;
      case '.': if (hits.length) this.selectHit.emit(Math.min(hits.length - 1, (sel ?? -1) + 1)); break;
      case ' ': case 'Enter': if (sel !== null) this.toggleHit.emit(sel); break;
      case 'Escape': this.range.set(null); break;
      default: return;
    }
    e.preventDefault();
  }

  private render(): void {
    const svg = d3.select(this.svgRef().nativeElement);
    const w = this.width();
    const v = this.view();
    const duration = this.durationSec();
    const x = d3.scaleLinear().domain([v.t0, v.t1]).range([left, w - 8]);
    const innerW = w - 8 - left;
    const kickTop = rows.ruler;
    const bassTop = kickTop + rows.kick + rows.gap;
    const overviewTop = bassTop + rows.bass + rows.gap;
    svg.attr('viewBox', `0 0 ${w} ${this.height}`).attr('width', w).attr('height', this.height);

    // Row backgrounds and names.
    const bands = [
      { key: 'kick', top: kickTop, h: rows.kick, label: 'Kick' },
      { key: 'bass', top: bassTop, h: rows.bass, label: 'Bass' },
    ];
    svg.selectAll<SVGRectElement, (typeof bands)[number]>('rect.band').data(bands, (d) => d.key).join('rect')
      .attr('class', (d) => `band band-${d.key}`).attr('x', left).attr('y', (d) => d.top).attr('width', innerW).attr('height', (d) => d.h);
    svg.selectAll<SVGTextElement, (typeof bands)[number]>('text.row-label').data(bands, (d) => d.key).join('text')
      .attr('class', (d) => `row-label row-${d.key}`).attr('x', 8).attr('y', (d) => d.top + 16).text((d) => d.label);

    // Ruler: bar.beat from the song's tempo.
    const ticks = rulerTicks(v, innerW, this.bpm(), this.beats(), this.beatUnit());
    const tick = svg.selectAll<SVGGElement, null>('g.ruler').data([null]).join('g').attr('class', 'ruler')
      .selectAll<SVGGElement, (typeof ticks)[number]>('g.tick').data(ticks, (d) => d.label).join((en) => {
        const g = en.append('g').attr('class', 'tick');
        g.append('line');
        g.append('text');
        return g;
      })
      .attr('transform', (d) => `translate(${x(d.timeSec)},0)`)
      .classed('major', (d) => d.major);
    tick.select('line').attr('y1', rows.ruler - 6).attr('y2', overviewTop - rows.gap);
    tick.select('text').attr('x', 3).attr('y', 13).text((d) => d.label);

    // Waveforms: min/max peaks of the level that fits the zoom.
    const wave = (ov: StemOverview | null, top: number, h: number, cls: string) => {
      let d = '';
      if (ov) {
        const level = pickLevel(ov, v, innerW);
        if (level) {
          const spb = level.samplesPerBucket / ov.sampleRateHz;
          const n = level.peaks.length / 2;
          const i0 = Math.max(0, Math.floor(v.t0 / spb) - 1);
          const i1 = Math.min(n - 1, Math.ceil(v.t1 / spb) + 1);
          const mid = top + h / 2;
          const amp = (h / 2) * 0.92;
          const idx = d3.range(i0, i1 + 1);
          d = d3.area<number>().x((i) => x(i * spb)).y0((i) => mid - level.peaks[2 * i] * amp).y1((i) => mid - level.peaks[2 * i + 1] * amp)(idx) ?? '';
        }
      }
      svg.selectAll<SVGPathElement, string>(`path.${cls}`).data([d]).join('path').attr('class', `wave ${cls}`).attr('d', (s) => s);
    };
    wave(this.kick(), kickTop, rows.kick, 'wave-kick');
    wave(this.bass(), bassTop, rows.bass, 'wave-bass');

    // Gain curves over the bass: 0 dB (or the base gain) at the top of the row.
    const curves = this.curves().filter((c) => !c.muted);
    const lowest = Math.min(-24, ...curves.map((c) => Math.max(c.floorDb, d3.min(c.points, (p) => p.gainDb) ?? 0)));
    const highest = Math.max(0, ...curves.map((c) => c.baseGainDb));
    const y = d3.scaleLinear().domain([lowest - 2, highest + 1]).range([bassTop + rows.bass - 2, bassTop + 3]);
    const visible = (pts: LaneCurveView['points']) => {
      const bis = d3.bisector((p: { timeSec: number }) => p.timeSec);
      const a = Math.max(0, bis.left(pts, v.t0) - 1);
      const b = Math.min(pts.length, bis.right(pts, v.t1) + 1);
      return pts.slice(a, b);
    };
    const curveData = curves.map((c) => ({ ...c, pts: visible(c.points), selected: c.laneId === (this.selectedLaneId() ?? curves[0]?.laneId) }));
    svg.selectAll<SVGPathElement, (typeof curveData)[number]>('path.curve-fill').data(curveData.filter((c) => c.selected), (d) => d.laneId).join('path')
      .attr('class', 'curve-fill')
            // The tucked region: between the base gain and the curve, so what the tucks take away reads at a glance.
      .attr('d', (c) => d3.area<{ timeSec: number; gainDb: number }>().x((p) => x(p.timeSec)).y0(y(c.baseGainDb)).y1((p) => y(p.gainDb))(c.pts));
    svg.selectAll<SVGPathElement, (typeof curveData)[number]>('path.curve').data(curveData, (d) => d.laneId).join('path')
      .attr('class', 'curve').classed('secondary', (c) => !c.selected)
      .attr('d', (c) => d3.line<{ timeSec: number; gainDb: number }>().x((p) => x(p.timeSec)).y((p) => y(p.gainDb))(c.pts));
    svg.selectAll<SVGGElement, null>('g.gain-axis').data([null]).join('g').attr('class', 'gain-axis')
      .attr('transform', `translate(${left},0)`)
      .call(d3.axisLeft(y).ticks(3).tickSize(3).tickFormat((d) => `${d} dB`));

    // Hit markers: on (solid), off (hollow grey), skipped by the bass gate (dashed).
    const hits = this.hits().filter((h) => h.timeSec >= v.t0 && h.timeSec <= v.t1);
    const sel = this.selectedHit();
    const marks = svg.selectAll<SVGGElement, null>('g.hits').data([null]).join('g').attr('class', 'hits')
      .selectAll<SVGGElement, HitView>('g.hit').data(hits.length > 3000 ? [] : hits, (h) => h.id)
      .join((en) => {
        const g = en.append('g').attr('class', 'hit');
        g.append('line');
        g.append('circle').attr('r', 5);
        g.append('title');
        return g;
      })
      .attr('transform', (h) => `translate(${x(h.timeSec)},0)`)
      .attr('class', (h) => `hit status-${h.status}${h.index === sel ? ' selected' : ''}`)
      .on('click', (e: MouseEvent, h) => {
        e.stopPropagation();
        this.selectHit.emit(h.index);
      })
      .on('dblclick', (e: MouseEvent, h) => {
        e.stopPropagation();
        this.toggleHit.emit(h.index);
      });
    marks.select('line').attr('y1', kickTop + 10).attr('y2', bassTop + rows.bass);
    marks.select('circle').attr('cy', kickTop + 8).attr('r', (h) => (h.index === sel ? 7 : 5));
    marks.select('title').text((h) => `Hit ${h.number} · ${h.timeSec.toFixed(3)} s · ${h.status === 'tucked' ? 'on' : h.status === 'off' ? 'off' : 'skipped by the bass gate'}`);

    // Changes from the kick's new revision, until the engineer acknowledges them.
    const rev = this.revision();
    const flags = rev
      ? [
          ...rev.added.map((t) => ({ t, kind: 'added', label: 'new' })),
          ...rev.removed.map((t) => ({ t, kind: 'removed', label: 'gone' })),
          ...rev.moved.map(([, t]) => ({ t, kind: 'moved', label: 'moved' })),
        ].filter((f) => f.t >= v.t0 && f.t <= v.t1)
      : [];
    svg.selectAll<SVGGElement, null>('g.revision').data([null]).join('g').attr('class', 'revision')
      .selectAll<SVGGElement, (typeof flags)[number]>('g.flag').data(flags.length > 2000 ? [] : flags)
      .join((en) => {
        const g = en.append('g');
        // A small triangle under the hit marker, pointing at the hit; the word only when zoomed in far enough to read it.
        g.append('path').attr('d', 'M0,0 L-4,6 L4,6 Z');
        g.append('text').attr('x', 6).attr('y', 7);
        g.append('title');
        return g;
      })
      .attr('class', (f) => `flag flag-${f.kind}`)
      .attr('transform', (f) => `translate(${x(f.t)},${kickTop + 15})`)
      .call((g) => g.select('text').text((f) => (flags.length <= 12 ? f.label : '')))
      .call((g) => g.select('title').text((f) => `${f.label === 'new' ? 'New hit' : f.label === 'gone' ? 'Hit no longer found' : 'Hit moved'} at ${f.t.toFixed(3)} s (new kick revision)`));

    // Range being selected (Shift+drag).
    const r = this.range();
    svg.selectAll<SVGRectElement, typeof r>('rect.range').data(r ? [r] : []).join('rect').attr('class', 'range')
      .attr('x', (d) => x(Math.max(v.t0, d!.fromSec))).attr('width', (d) => Math.max(1, x(Math.min(v.t1, d!.toSec)) - x(Math.max(v.t0, d!.fromSec))))
      .attr('y', kickTop).attr('height', bassTop + rows.bass - kickTop);

    // Overview strip: the whole song, and where the view is.
    const ox = d3.scaleLinear().domain([0, duration]).range([left, w - 8]);
    svg.selectAll<SVGRectElement, null>('rect.overview').data([null]).join('rect').attr('class', 'overview')
      .attr('x', left).attr('y', overviewTop).attr('width', innerW).attr('height', rows.overview);
    const kickOv = this.kick();
    const coarse = kickOv ? [...kickOv.levels].sort((a, b) => b.samplesPerBucket - a.samplesPerBucket)[0] : null;
    const ovPath = kickOv && coarse
      ? d3.area<number>()
          .x((i) => ox((i * coarse.samplesPerBucket) / kickOv.sampleRateHz))
          .y0(overviewTop + rows.overview - 2)
          .y1((i) => overviewTop + rows.overview - 2 - Math.max(Math.abs(coarse.peaks[2 * i]), Math.abs(coarse.peaks[2 * i + 1])) * (rows.overview - 4))(
          d3.range(coarse.peaks.length / 2),
        ) ?? ''
      : '';
    svg.selectAll<SVGPathElement, string>('path.overview-wave').data([ovPath]).join('path').attr('class', 'overview-wave').attr('d', (d) => d);
    svg.selectAll<SVGRectElement, TimeView>('rect.viewport').data([v]).join('rect').attr('class', 'viewport')
      .attr('x', (d) => ox(d.t0)).attr('width', (d) => Math.max(3, ox(d.t1) - ox(d.t0))).attr('y', overviewTop).attr('height', rows.overview);
    svg.selectAll<SVGTextElement, null>('text.ov-label').data([null]).join('text').attr('class', 'ov-label')
      .attr('x', 8).attr('y', overviewTop + 14).text('Song');

    this.bindGestures(svg, x, ox, overviewTop);
  }

  private bindGestures(
    svg: d3.Selection<SVGSVGElement, unknown, null, undefined>,
    x: d3.ScaleLinear<number, number>,
    ox: d3.ScaleLinear<number, number>,
    overviewTop: number,
  ): void {
    const duration = this.durationSec();
    svg.on('wheel', (e: WheelEvent) => {
      e.preventDefault();
      const v = this.view();
      if (e.shiftKey || Math.abs(e.deltaX) > Math.abs(e.deltaY)) {
        const delta = (e.shiftKey ? e.deltaY : e.deltaX) || e.deltaY;
        this.view.set(panView(v, (delta / 600) * (v.t1 - v.t0), duration));
      } else {
        const [px] = d3.pointer(e);
        this.view.set(zoomView(v, Math.pow(1.0015, e.deltaY), x.invert(px), duration));
      }
    });

    svg.on('pointerdown', (e: PointerEvent) => {
      if ((e.target as Element).closest('g.hit') || e.button !== 0) return;
      const [px, py] = d3.pointer(e);
      const mode = py >= overviewTop ? 'overview' : e.shiftKey ? 'range' : 'pan';
      this.drag = { startX: px, startView: this.view(), mode, moved: false };
      (e.currentTarget as Element).setPointerCapture?.(e.pointerId);
      if (mode === 'overview') this.view.set(centreOn(this.view(), ox.invert(px), duration));
      if (mode === 'range') this.range.set({ fromSec: x.invert(px), toSec: x.invert(px) });
    });
    svg.on('pointermove', (e: PointerEvent) => {
      const drag = this.drag;
      if (!drag) return;
      const [px] = d3.pointer(e);
      if (Math.abs(px - drag.startX) > 2) drag.moved = true;
      const v = drag.startView;
      if (drag.mode === 'pan') {
        const secPerPx = (v.t1 - v.t0) / (x.range()[1] - x.range()[0]);
        this.view.set(panView(v, -(px - drag.startX) * secPerPx, duration));
      } else if (drag.mode === 'overview') {
        this.view.set(centreOn(this.view(), ox.invert(px), duration));
      } else {
        const a = x.invert(drag.startX);
        const b = x.invert(px);
        this.range.set({ fromSec: Math.max(0, Math.min(a, b)), toSec: Math.min(duration, Math.max(a, b)) });
      }
    });
    svg.on('pointerup pointercancel', () => {
      const drag = this.drag;
      if (drag?.mode === 'range') {
        const r = this.range();
        if (r && drag.moved && r.toSec > r.fromSec) this.rangeSelect.emit(r);
        else this.range.set(null);
      }
      this.drag = null;
    });
  }
}
