import { ChangeDetectionStrategy, Component, ElementRef, afterRenderEffect, computed, input, output, signal, viewChild } from '@angular/core';
import { FormsModule } from '@angular/forms';
import { MatButtonModule } from '@angular/material/button';
import { MatButtonToggleModule } from '@angular/material/button-toggle';
import { MatFormFieldModule } from '@angular/material/form-field';
import { MatInputModule } from '@angular/material/input';
import { MatTooltipModule } from '@angular/material/tooltip';
import * as d3 from 'd3';
import { ShapeSummary, TuckShape, describeShape, reshape, tuckShapeSchema } from '../../../../shared/schemas/tuck-shape';
import { XY, drawnOutline, guardedOutline, shapeDomain } from './shape-geometry';
import { addPoint, keyStep, movePoint, removePoint, setSegmentCurve } from './shape-edit';

export interface ShapeEdit {
  shape: TuckShape;
  /** Edits with the same key (one drag, one run of arrow presses) are one undo step. */
  mergeKey: string | null;
}

const margin = { top: 14, right: 16, bottom: 30, left: 46 };
const height = 260;

/**
 * Draws the tuck once: breakpoints to drag (or move with the arrow keys), the
 * shape as the slope guard will write it, and the numbers beside it. Emits
 * every change; the parent keeps the history and re-stamps the song.
 */
@Component({
  selector: 'tl-tuck-editor',
  imports: [FormsModule, MatFormFieldModule, MatInputModule, MatButtonModule, MatButtonToggleModule, MatTooltipModule],
  templateUrl: './tuck-editor.html',
  styleUrl: './tuck-editor.scss',
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class TuckEditor {
  readonly shape = input.required<TuckShape>();
  /** An averaged kick envelope around the hit (0…1 amplitude against ms), drawn behind the shape. */
  readonly kickEnvelope = input<XY[] | null>(null);
  readonly canUndo = input(false);
  readonly canRedo = input(false);
  readonly edit = output<ShapeEdit>();
  readonly undo = output<void>();
  readonly redo = output<void>();

  private readonly svgRef = viewChild.required<ElementRef<SVGSVGElement>>('svg');
  protected readonly width = signal(640);
  protected readonly selected = signal<number | null>(1);
  private frozenDomain: ReturnType<typeof shapeDomain> | null = null;
  private keyRun = 0;
  /** Merge key of the drag in progress (one drag = one undo step); on the instance because redraws re-bind handlers. */
  private dragKey = '';

  protected readonly summary = computed<ShapeSummary>(() => describeShape(this.shape()));
  protected readonly drawn = computed(() => drawnOutline(this.shape()));
  protected readonly guarded = computed(() => guardedOutline(this.shape()));
  protected readonly selectedPoint = computed(() => {
    const i = this.selected();
    const pts = this.shape().points;
    return i !== null && i < pts.length ? { index: i, point: pts[i], isLast: i === pts.length - 1 } : null;
  });
  protected readonly announce = computed(() => {
    const s = this.selectedPoint();
    return s ? `Breakpoint ${s.index + 1} of ${this.shape().points.length}: ${fmt(s.point.tMs)} ms, ${fmt(s.point.gainDb)} dB` : '';
  });

  constructor() {
    afterRenderEffect(() => this.render());
    afterRenderEffect((onCleanup) => {
      const el = this.svgRef().nativeElement.parentElement!;
      const ro = new ResizeObserver(([entry]) => this.width.set(Math.max(320, Math.floor(entry.contentRect.width))));
      ro.observe(el);
      onCleanup(() => ro.disconnect());
    });
  }

  // ---- numeric twins -------------------------------------------------------

  protected setSummary(field: keyof ShapeSummary, value: number | null): void {
    if (value === null || !Number.isFinite(value)) return;
    const next = reshape(this.shape(), { [field]: field === 'depthDb' ? -Math.abs(value) : Math.max(0, value) });
    this.emitIfValid(next, null);
  }

  protected setOption(field: 'floorDb' | 'slopeGuardMs', value: number | null): void {
    if (value === null || !Number.isFinite(value)) return;
    this.emitIfValid({ ...this.shape(), [field]: value }, null);
  }

  protected setPointField(field: 'tMs' | 'gainDb', value: number | null): void {
    const s = this.selectedPoint();
    if (!s || value === null || !Number.isFinite(value)) return;
    const p = s.point;
    this.emitIfValid(movePoint(this.shape(), s.index, field === 'tMs' ? value : p.tMs, field === 'gainDb' ? value : p.gainDb), null);
  }

  protected setCurve(curve: 'linear' | 'smooth'): void {
    const s = this.selectedPoint();
    if (s) this.emitIfValid(setSegmentCurve(this.shape(), s.index, curve), null);
  }

  protected addAfterSelected(): void {
    const pts = this.shape().points;
    const i = Math.min(this.selected() ?? 0, pts.length - 2);
    const a = pts[i];
    const b = pts[i + 1];
    const { shape, index } = addPoint(this.shape(), (a.tMs + b.tMs) / 2, (a.gainDb + b.gainDb) / 2);
    if (index >= 0) {
      this.selected.set(index);
      this.emitIfValid(shape, null);
    }
  }

  protected removeSelected(): void {
    const i = this.selected();
    if (i === null || this.shape().points.length <= 2) return;
    this.selected.set(Math.max(0, i - 1));
    this.emitIfValid(removePoint(this.shape(), i), null);
  }

  protected onKey(event: KeyboardEvent): void {
    const i = this.selected();
    if (i === null) return;
    if (event.key === 'Delete' || event.key === 'Backspace') {
      event.preventDefault();
      this.removeSelected();
      return;
    }
    if (event.key === 'Tab') return;
    if (event.key === '[' || event.key === ']') {
      event.preventDefault();
      const n = this.shape().points.length;
      this.selected.set((i + (event.key === ']' ? 1 : n - 1)) % n);
      this.focusPoint();
      return;
    }
    const step = keyStep(event.key, event.shiftKey);
    if (!step) return;
    event.preventDefault();
    // A held key (auto-repeat) is one undo step; each new press starts another.
    if (!event.repeat) this.keyRun++;
    const p = this.shape().points[i];
    this.emitIfValid(movePoint(this.shape(), i, p.tMs + step.dtMs, p.gainDb + step.dDb), `key-${i}-${this.keyRun}`);
  }

  protected sealKeys(): void {
    this.keyRun++;
  }

  private emitIfValid(next: TuckShape, mergeKey: string | null): void {
    const parsed = tuckShapeSchema.safeParse(next);
    if (parsed.success) this.edit.emit({ shape: parsed.data, mergeKey });
  }

  private focusPoint(): void {
    queueMicrotask(() => {
      const el = this.svgRef().nativeElement.querySelector<SVGCircleElement>(`circle.point[data-index="${this.selected()}"]`);
      el?.focus();
    });
  }

  // ---- drawing ---------------------------------------------------------------

  private render(): void {
    const svg = d3.select(this.svgRef().nativeElement);
    const w = this.width();
    const shape = this.shape();
    const drawn = this.drawn();
    const guarded = this.guarded();
    const selected = this.selected();
    const domain = this.frozenDomain ?? shapeDomain(drawn, guarded);
    const x = d3.scaleLinear().domain([domain.t0, domain.t1]).range([margin.left, w - margin.right]);
    const y = d3.scaleLinear().domain([domain.gMin, 0]).range([height - margin.bottom, margin.top]);

    svg.attr('viewBox', `0 0 ${w} ${height}`).attr('width', w).attr('height', height);

    const grid = svg.selectAll<SVGGElement, null>('g.grid').data([null]).join('g').attr('class', 'grid');
    grid
      .selectAll<SVGLineElement, number>('line.gy')
      .data(y.ticks(6))
      .join('line')
      .attr('class', 'gy')
      .attr('x1', margin.left)
      .attr('x2', w - margin.right)
      .attr('y1', (d) => y(d))
      .attr('y2', (d) => y(d));
    grid
      .selectAll<SVGLineElement, number>('line.hit')
      .data([0])
      .join('line')
      .attr('class', 'hit')
      .attr('x1', x(0))
      .attr('x2', x(0))
      .attr('y1', margin.top)
      .attr('y2', height - margin.bottom);

    svg
      .selectAll<SVGGElement, null>('g.ax')
      .data([null])
      .join('g')
      .attr('class', 'ax')
      .attr('transform', `translate(0,${height - margin.bottom})`)
      .call(d3.axisBottom(x).ticks(Math.max(3, Math.floor(w / 90))).tickFormat((d) => `${d} ms`));
    svg
      .selectAll<SVGGElement, null>('g.ay')
      .data([null])
      .join('g')
      .attr('class', 'ay')
      .attr('transform', `translate(${margin.left},0)`)
      .call(d3.axisLeft(y).ticks(6).tickFormat((d) => `${d} dB`));

    // The kick's averaged envelope, mirrored around the 0 dB line's lower half so it reads as "how long the kick is".
    const env = this.kickEnvelope();
    const envY = d3.scaleLinear().domain([0, 1]).range([height - margin.bottom, margin.top + (height - margin.top - margin.bottom) * 0.35]);
    svg
      .selectAll<SVGPathElement, XY[]>('path.kick')
      .data(env ? [env] : [])
      .join('path')
      .attr('class', 'kick')
      .attr('d', (d) => d3.area<XY>().x((p) => x(p.tMs)).y0(height - margin.bottom).y1((p) => envY(p.gainDb))(d.filter((p) => p.tMs >= domain.t0 && p.tMs <= domain.t1)));

    const line = d3.line<XY>().x((p) => x(p.tMs)).y((p) => y(p.gainDb));
    const area = d3.area<XY>().x((p) => x(p.tMs)).y0(y(0)).y1((p) => y(p.gainDb));
    svg.selectAll<SVGPathElement, XY[]>('path.guarded-fill').data([guarded]).join('path').attr('class', 'guarded-fill').attr('d', area);
    svg.selectAll<SVGPathElement, XY[]>('path.guarded').data([guarded]).join('path').attr('class', 'guarded').attr('d', line);
    svg.selectAll<SVGPathElement, XY[]>('path.drawn').data([drawn]).join('path').attr('class', 'drawn').attr('d', line);

    const points = svg
      .selectAll<SVGGElement, null>('g.points')
      .data([null])
      .join('g')
      .attr('class', 'points')
      .selectAll<SVGCircleElement, { p: XY; i: number }>('circle.point')
      .data(shape.points.map((p, i) => ({ p, i })), (d) => String(d.i))
      .join((enter) =>
        enter
          .append('circle')
          .attr('class', 'point')
          .attr('tabindex', 0)
          .attr('role', 'button')
          .attr('aria-roledescription', 'breakpoint'),
      )
      .attr('data-index', (d) => d.i)
      .attr('cx', (d) => x(d.p.tMs))
      .attr('cy', (d) => y(d.p.gainDb))
      .attr('r', (d) => (d.i === selected ? 8 : 6))
      .classed('selected', (d) => d.i === selected)
      .attr('aria-label', (d) => `Breakpoint ${d.i + 1}: ${fmt(d.p.tMs)} ms, ${fmt(d.p.gainDb)} dB`)
      .on('focus', (_e, d) => this.selected.set(d.i))
      .on('keydown', (e: KeyboardEvent) => this.onKey(e))
      .on('keyup', (e: KeyboardEvent) => {
        if (e.key.startsWith('Arrow')) this.sealKeys();
      });

    points.call(
      d3
        .drag<SVGCircleElement, { p: XY; i: number }>()
        .on('start', (e, d) => {
          this.frozenDomain = domain;
          this.dragKey = `drag-${d.i}-${Date.now()}`;
          this.selected.set(d.i);
          (e.sourceEvent as Event).preventDefault?.();
        })
        .on('drag', (e, d) => {
          const frozen = this.frozenDomain ?? domain;
          const xs = d3.scaleLinear().domain([frozen.t0, frozen.t1]).range([margin.left, this.width() - margin.right]);
          const ys = d3.scaleLinear().domain([frozen.gMin, 0]).range([height - margin.bottom, margin.top]);
          this.emitIfValid(movePoint(this.shape(), d.i, xs.invert(e.x), ys.invert(e.y)), this.dragKey);
        })
        .on('end', () => {
          this.frozenDomain = null;
          this.width.update((v) => v); // redraw with a fresh domain
          this.focusPoint();
        }),
    );

    // Double-click on empty space adds a breakpoint there.
    svg.on('dblclick', (e: MouseEvent) => {
      if ((e.target as Element).classList.contains('point')) return;
      const [px, py] = d3.pointer(e);
      const { shape: next, index } = addPoint(this.shape(), x.invert(px), y.invert(py));
      if (index >= 0) {
        this.selected.set(index);
        this.emitIfValid(next, null);
      }
    });
  }
}

function fmt(v: number): string {
  return (Math.round(v * 100) / 100).toString().replace('-', '−');
}
