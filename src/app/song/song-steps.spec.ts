import { isStepId, stepsFor } from './song-steps';

describe('stepsFor', () => {
  it('starts a new song with nothing done', () => {
    const steps = stepsFor({ stemCount: 0, hitCount: null });
    expect(steps.map((s) => s.state)).toEqual(['todo', 'todo', 'todo', 'todo', 'todo']);
    expect(steps[0].stateText).toBe('No stems yet');
  });

  it('moves attention forward as the song fills in', () => {
    expect(stepsFor({ stemCount: 2, hitCount: null }).map((s) => s.state)).toEqual(['done', 'attention', 'todo', 'todo', 'todo']);
    const later = stepsFor({ stemCount: 2, hitCount: 128 }, { lanesWithShape: 1, exportCount: 3 });
    expect(later.map((s) => s.state)).toEqual(['done', 'done', 'done', 'attention', 'done']);
    expect(later[1].stateText).toBe('128 hits');
    expect(later[4].stateText).toBe('3 files');
  });

  it('flags a missing kick', () => {
    expect(stepsFor({ stemCount: 1, hitCount: null }, { hasKickSource: false })[0]).toMatchObject({ state: 'attention', stateText: 'Needs a kick' });
  });

  it('recognises step ids only', () => {
    expect(isStepId('tuck')).toBe(true);
    expect(isStepId('mixer')).toBe(false);
    expect(isStepId(undefined)).toBe(false);
  });
});
