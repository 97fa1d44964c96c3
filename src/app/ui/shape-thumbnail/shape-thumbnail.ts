import { DecimalPipe } from '@angular/common';
import { ChangeDetectionStrategy, Component, computed, input } from '@angular/core';
import { describeShape } from '../../../../shared/schemas/tuck-shape';
import { DrawnShape, PlotBox, ShapeDomain, shapeDomain, shapePaths, xOf, yOf } from './shape-geometry';

/**
 * A small drawing of a tuck shape: time relative to the hit across, gain down
 * from 0 dB. Given `compare`, both shapes share one pair of axes with a legend
 * (the current one amber and filled, the other teal and dashed).
 */
@Component({
  selector: 'tl-shape-thumbnail',
  template: `
    <svg [attr.viewBox]="'0 0 ' + box().width + ' ' + box().height" role="img" [attr.aria-label]="description()">
      @if (detailed()) {
        <line class="grid" [attr.x1]="left()" [attr.x2]="box().width - box().pad" [attr.y1]="zeroY()" [attr.y2]="zeroY()" />
        <line class="grid" [attr.x1]="left()" [attr.x2]="box().width - box().pad" [attr.y1]="floorY()" [attr.y2]="floorY()" />
        @if (hitX() !== null) { <line class="hit" [attr.x1]="hitX()" [attr.x2]="hitX()" [attr.y1]="box().pad - 4" [attr.y2]="box().height - box().pad + 4" /> }
        <text class="tick end" [attr.x]="left() - 6" [attr.y]="zeroY() + 4">0 dB</text>
        <text class="tick end" [attr.x]="left() - 6" [attr.y]="floorY() + 4">{{ domain().gainMinDb | number: '1.0-0' }} dB</text>
        <text class="tick" [attr.x]="left()" [attr.y]="box().height - 4">{{ domain().tMinMs | number: '1.0-0' }} ms</text>
        <text class="tick end" [attr.x]="box().width - box().pad" [attr.y]="box().height - 4">{{ domain().tMaxMs | number: '1.0-0' }} ms</text>
        @if (hitX() !== null) { <text class="tick mid" [attr.x]="hitX()" [attr.y]="box().pad - 8">hit</text> }
      }
      @if (comparePaths(); as c) {
        <path class="line compare" [attr.d]="c.line" />
      }
      <path class="area" [attr.d]="paths().area" />
      <path class="line" [attr.d]="paths().line" />
    </svg>
    @if (compare()) {
      <div class="legend">
        <span class="key current"><span class="swatch" aria-hidden="true"></span>{{ label() }}</span>
        <span class="key other"><span class="swatch" aria-hidden="true"></span>{{ compareLabel() }}</span>
      </div>
    }
  `,
  imports: [DecimalPipe],
  styles: `
    :host { display: block; }
    svg { display: block; width: 100%; height: auto; overflow: visible; }
    .line { fill: none; stroke: var(--tl-line-curve); stroke-width: 2; stroke-linejoin: round; vector-effect: non-scaling-stroke; }
    .line.compare { stroke: var(--tl-line-kick); stroke-dasharray: 5 3; }
    .area { fill: var(--tl-fill-curve); stroke: none; }
    .grid { stroke: var(--tl-line-grid); stroke-width: 1; stroke-dasharray: 2 3; vector-effect: non-scaling-stroke; }
    .hit { stroke: var(--tl-line-hit); stroke-width: 1; vector-effect: non-scaling-stroke; }
    .tick { fill: var(--tl-text-muted); font-size: 12px; font-variant-numeric: tabular-nums; }
    .tick.end { text-anchor: end; }
    .tick.mid { text-anchor: middle; }
    .legend { display: flex; gap: var(--tl-space-4); margin-top: var(--tl-space-2); font-size: 14px; }
    .key { display: inline-flex; align-items: center; gap: var(--tl-space-2); }
    .swatch { display: inline-block; width: 22px; height: 0; border-top: 2px solid var(--tl-line-curve); }
    .other .swatch { border-top: 2px dashed var(--tl-line-kick); }
    .current { color: var(--tl-text-curve); }
    .other { color: var(--tl-text-kick); }
  `,
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class ShapeThumbnail {
  readonly shape = input.required<DrawnShape>();
  readonly compare = input<DrawnShape | null>(null);
  /** Axes, 0 dB and hit lines with labels: for the large views. */
  readonly detailed = input(false);
  readonly label = input('Current');
  readonly compareLabel = input('Other version');
  /** Axes shared with other drawings (a list of thumbnails on one scale); by default fitted to the shape(s). */
  readonly scale = input<ShapeDomain | null>(null);

  protected readonly box = computed<PlotBox>(() => (this.detailed() ? { width: 480, height: 210, pad: 24, padLeft: 52 } : { width: 160, height: 56, pad: 4 }));
  protected readonly domain = computed(() => {
    const fixed = this.scale();
    if (fixed) return fixed;
    const other = this.compare();
    return shapeDomain(other ? [this.shape(), other] : [this.shape()]);
  });
  protected readonly paths = computed(() => shapePaths(this.shape(), this.domain(), this.box()));
  protected readonly comparePaths = computed(() => {
    const other = this.compare();
    return other ? shapePaths(other, this.domain(), this.box()) : null;
  });
  protected readonly left = computed(() => this.box().padLeft ?? this.box().pad);
  protected readonly zeroY = computed(() => yOf(0, this.domain(), this.box()));
  protected readonly floorY = computed(() => yOf(this.domain().gainMinDb, this.domain(), this.box()));
  protected readonly hitX = computed(() => {
    const d = this.domain();
    return d.tMinMs <= 0 && d.tMaxMs >= 0 ? xOf(0, d, this.box()) : null;
  });
  protected readonly description = computed(() => {
    const s = describeShape({ points: [...this.shape().points] });
    const text = `Tuck shape: lead-in ${round(s.leadInMs)} ms, depth ${round(s.depthDb)} dB, hold ${round(s.holdMs)} ms, recovery ${round(s.recoveryMs)} ms`;
    return this.compare() ? `${text}; drawn with ${this.compareLabel()} for comparison` : text;
  });
}

function round(n: number): number {
  return Math.round(n * 10) / 10;
}
