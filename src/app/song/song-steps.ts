import { Song } from '../../../shared/schemas/song';
import { IconName } from '../ui/icon/icons';

export const stepIds = ['stems', 'hits', 'tuck', 'check', 'export'] as const;
export type StepId = (typeof stepIds)[number];
export type StepState = 'done' | 'attention' | 'todo';

export interface StepView {
  id: StepId;
  label: string;
  state: StepState;
  /** The state in words, read beside the icon. */
  stateText: string;
}

export const stateIcons: Record<StepState, IconName> = { done: 'done', attention: 'attention', todo: 'todo' };

/** What the workspace knows beyond the song record; filled in as later steps land. */
export interface WorkspaceProgress {
  hasKickSource?: boolean;
  hasBassStem?: boolean;
  lanesWithShape?: number;
  checked?: boolean;
  exportCount?: number;
}

export function isStepId(value: unknown): value is StepId {
  return typeof value === 'string' && (stepIds as readonly string[]).includes(value);
}

/** Each step's state, derived from what the song already has. */
export function stepsFor(song: Pick<Song, 'stemCount' | 'hitCount'>, progress: WorkspaceProgress = {}): StepView[] {
  const stems: StepView =
    song.stemCount === 0
      ? { id: 'stems', label: 'Stems', state: 'todo', stateText: 'No stems yet' }
      : progress.hasKickSource === false || progress.hasBassStem === false
        ? { id: 'stems', label: 'Stems', state: 'attention', stateText: progress.hasKickSource === false ? 'Needs a kick' : 'Needs a bass' }
        : { id: 'stems', label: 'Stems', state: 'done', stateText: `${song.stemCount} ${song.stemCount === 1 ? 'stem' : 'stems'}` };

  const hits: StepView =
    song.hitCount !== null
      ? { id: 'hits', label: 'Hits', state: 'done', stateText: `${song.hitCount} ${song.hitCount === 1 ? 'hit' : 'hits'}` }
      : song.stemCount > 0
        ? { id: 'hits', label: 'Hits', state: 'attention', stateText: 'Ready to detect' }
        : { id: 'hits', label: 'Hits', state: 'todo', stateText: 'Waiting for a kick' };

  const shaped = progress.lanesWithShape ?? 0;
  const tuck: StepView =
    shaped > 0
      ? { id: 'tuck', label: 'Tuck', state: 'done', stateText: `${shaped} ${shaped === 1 ? 'lane' : 'lanes'} shaped` }
      : song.hitCount !== null
        ? { id: 'tuck', label: 'Tuck', state: 'attention', stateText: 'Draw a tuck' }
        : { id: 'tuck', label: 'Tuck', state: 'todo', stateText: 'Waiting for hits' };

  const check: StepView = progress.checked
    ? { id: 'check', label: 'Check', state: 'done', stateText: 'Checked' }
    : { id: 'check', label: 'Check', state: shaped > 0 ? 'attention' : 'todo', stateText: shaped > 0 ? 'Not checked' : 'Waiting for a tuck' };

  const exports = progress.exportCount ?? 0;
  const exportStep: StepView =
    exports > 0
      ? { id: 'export', label: 'Export', state: 'done', stateText: `${exports} ${exports === 1 ? 'file' : 'files'}` }
      : { id: 'export', label: 'Export', state: 'todo', stateText: 'Nothing exported' };

  return [stems, hits, tuck, check, exportStep];
}
