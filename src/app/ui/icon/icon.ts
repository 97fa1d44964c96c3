import { ChangeDetectionStrategy, Component, computed, input } from '@angular/core';
import { IconName, icons } from './icons';

/** A decorative line icon; the text beside it carries the meaning. */
@Component({
  selector: 'tl-icon',
  template: `<svg viewBox="0 0 24 24" aria-hidden="true" focusable="false"><path [attr.d]="path()" /></svg>`,
  styles: `
    :host { display: inline-flex; width: 24px; height: 24px; flex: none; vertical-align: middle; }
    svg { width: 100%; height: 100%; fill: none; stroke: currentColor; stroke-width: 1.75; stroke-linecap: round; stroke-linejoin: round; }
  `,
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class Icon {
  readonly name = input.required<IconName>();
  protected readonly path = computed(() => icons[this.name()]);
}
