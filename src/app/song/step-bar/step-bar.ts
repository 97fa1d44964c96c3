import { ChangeDetectionStrategy, Component, input, output } from '@angular/core';
import { Icon } from '../../ui/icon/icon';
import { StepId, StepView, stateIcons } from '../song-steps';

/** The five steps of a song, left to right, each with its state in words and an icon; any step opens at any time. */
@Component({
  selector: 'tl-step-bar',
  imports: [Icon],
  templateUrl: './step-bar.html',
  styleUrl: './step-bar.scss',
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class StepBar {
  readonly steps = input.required<StepView[]>();
  readonly active = input.required<StepId>();
  readonly selectStep = output<StepId>();

  protected readonly stateIcons = stateIcons;
}
