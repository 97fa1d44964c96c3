import { presetDto } from '../../../testing/presets';
import { editedFields, presetToForm, reapplyEdits } from './preset-form-value';

describe('preset form edits', () => {
  const loaded = presetToForm(presetDto());

  it('finds exactly the fields a person changed', () => {
    const mine = structuredClone(loaded);
    expect(editedFields(loaded, mine)).toEqual([]);
    mine.name = 'Trap 808 deeper';
    mine.shape.points[1].gainDb = -24;
    mine.shape.slopeGuardMs = 8;
    expect(editedFields(loaded, mine)).toEqual(['name', 'points', 'slopeGuardMs']);
  });

  it('lays the person’s edits over the newer version and keeps the rest of it', () => {
    const mine = structuredClone(loaded);
    mine.name = 'Trap 808 deeper';
    const fresh = presetToForm(presetDto({ version: 3, notes: 'Theirs.', gateThresholdDbfs: -44 }));
    const merged = reapplyEdits(fresh, mine, editedFields(loaded, mine));
    expect(merged.name).toBe('Trap 808 deeper');
    expect(merged.notes).toBe('Theirs.');
    expect(merged.gateThresholdDbfs).toBe(-44);
    // Nothing is shared with the inputs.
    merged.shape.points[0].tMs = -1;
    expect(fresh.shape.points[0].tMs).toBe(-3);
  });
});
