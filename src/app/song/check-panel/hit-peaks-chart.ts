import { ChangeDetectionStrategy, Component, ElementRef, effect, input, viewChild } from '@angular/core';
import * as d3 from 'd3';

interface PerHit {
  hitId: string;
  timeSec: number;
  beforeDbfs: number;
  afterDbfs: number;
}

/** Per-hit peaks of kick + bass over the song: before (bass colour) and after the tucks (curve colour). */
@Component({
  selector: 'tl-hit-peaks-chart',
  template: `<svg #svg role="img" [attr.aria-label]="label()"></svg>
    <p class="legend"><span class="key before"></span> before the tucks <span class="key after"></span> after</p>`,
  styles: `
    :host { display: block; }
    svg { width: 100%; height: 200px; display: block; }
    .legend { color: var(--tl-text-muted); margin: 4px 0 0; }
    .key { display: inline-block; width: 10px; height: 10px; border-radius: 50%; margin: 0 4px 0 12px; vertical-align: middle; }
    .key.before { background: var(--tl-line-bass); }
    .key.after { background: var(--tl-line-curve); }
  `,
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class HitPeaksChart {
  readonly perHit = input.required<PerHit[]>();
  readonly durationSec = input.required<number>();
  readonly selectedHitId = input<string | null>(null);

  private readonly svg = viewChild.required<ElementRef<SVGSVGElement>>('svg');

  protected label(): string {
    const hits = this.perHit();
    const finite = (v: number) => Number.isFinite(v);
    const before = Math.max(...hits.map((h) => h.beforeDbfs).filter(finite));
    const after = Math.max(...hits.map((h) => h.afterDbfs).filter(finite));
    return `Peaks at ${hits.length} hits: highest ${before.toFixed(1)} dBFS before the tucks, ${after.toFixed(1)} dBFS after.`;
  }

  constructor() {
    effect(() => this.draw(this.perHit(), this.durationSec()));
  }

  private draw(hits: PerHit[], durationSec: number): void {
    const el = this.svg().nativeElement;
    const width = el.clientWidth || 800;
    const height = 200;
    const m = { top: 10, right: 12, bottom: 24, left: 52 };
    const values = hits.flatMap((h) => [h.beforeDbfs, h.afterDbfs]).filter((v) => Number.isFinite(v));
    const lo = Math.floor(Math.min(-24, ...values) / 3) * 3;
    const hi = Math.ceil(Math.max(0, ...values) / 3) * 3;
    const x = d3.scaleLinear([0, durationSec], [m.left, width - m.right]);
    const y = d3.scaleLinear([lo, hi], [height - m.bottom, m.top]);
    const svg = d3.select(el).attr('viewBox', `0 0 ${width} ${height}`);
    svg.selectAll('*').remove();
    svg
      .append('g')
      .attr('transform', `translate(0,${height - m.bottom})`)
      .call(d3.axisBottom(x).ticks(8).tickFormat((d) => `${d} s`))
      .attr('color', 'var(--tl-text-muted)');
    svg
      .append('g')
      .attr('transform', `translate(${m.left},0)`)
      .call(d3.axisLeft(y).ticks(5).tickFormat((d) => `${d} dBFS`))
      .attr('color', 'var(--tl-text-muted)');
    const dot = (key: 'beforeDbfs' | 'afterDbfs', colour: string) =>
      svg
        .append('g')
        .selectAll('circle')
        .data(hits.filter((h) => Number.isFinite(h[key])))
        .join('circle')
        .attr('cx', (h) => x(h.timeSec))
        .attr('cy', (h) => y(h[key]))
        .attr('r', 2.5)
        .attr('fill', colour);
    dot('beforeDbfs', 'var(--tl-line-bass)');
    dot('afterDbfs', 'var(--tl-line-curve)');
  }
}
