import { describe, expect, it } from 'vitest';
import { describeShape, laneStampSchema, reshape, tuckShapeSchema } from './tuck-shape';
import { midiExportOptionsSchema } from './export-options';

const cliFile = '{"points":[{"tMs":-3,"gainDb":0},{"tMs":0,"gainDb":-40},{"tMs":50,"gainDb":-40},{"tMs":150,"gainDb":0}],"slopeGuardMs":5}';

describe('tuck shape schema', () => {
  it('parses the CLI example file and fills the defaults', () => {
    const s = tuckShapeSchema.parse(JSON.parse(cliFile));
    expect(s).toMatchObject({ slopeGuardMs: 5, depthDb: null, floorDb: -60 });
    expect(s.points).toHaveLength(4);
  });

  it('refuses times that do not rise, gains above 0 dB and too few points', () => {
    expect(tuckShapeSchema.safeParse({ points: [{ tMs: 0, gainDb: -1 }, { tMs: 0, gainDb: 0 }] }).success).toBe(false);
    expect(tuckShapeSchema.safeParse({ points: [{ tMs: 0, gainDb: 1 }, { tMs: 1, gainDb: 0 }] }).success).toBe(false);
    expect(tuckShapeSchema.safeParse({ points: [{ tMs: 0, gainDb: 0 }] }).success).toBe(false);
    expect(tuckShapeSchema.safeParse({ points: [{ tMs: 0, gainDb: 0 }, { tMs: 1, gainDb: 0 }], slopeGuardMs: 0.1 }).success).toBe(false);
  });

  it('lane defaults: base gain 0 dB, gate on at −50 dBFS; MIDI defaults CC 11, channel 1, 960 PPQ', () => {
    const lane = laneStampSchema.parse({ shape: JSON.parse(cliFile) });
    expect(lane).toMatchObject({ baseGainDb: 0, gate: { enabled: true, thresholdDbfs: -50 } });
    expect(midiExportOptionsSchema.parse({})).toMatchObject({ cc: 11, channel: 1, ppq: 960, fourteenBit: false, markerTrack: false, bpm: 120, timeSignature: [4, 4] });
    expect(midiExportOptionsSchema.safeParse({ cc: 40, fourteenBit: true }).success).toBe(false);
  });
});

describe('describeShape / reshape', () => {
  const shape = tuckShapeSchema.parse(JSON.parse(cliFile));
  it('reads lead-in, depth, hold and recovery off the points', () => {
    expect(describeShape(shape)).toEqual({ leadInMs: 3, depthDb: -40, holdMs: 50, recoveryMs: 100 });
  });

  it('applies each numeric field and reads it back; the result still validates', () => {
    for (const patch of [{ leadInMs: 8 }, { depthDb: -24 }, { holdMs: 20 }, { recoveryMs: 250 }, { leadInMs: 1, holdMs: 5, recoveryMs: 30, depthDb: -6 }]) {
      const next = reshape(shape, patch);
      expect(tuckShapeSchema.safeParse(next).success).toBe(true);
      const d = describeShape(next);
      for (const [k, v] of Object.entries(patch)) expect(d[k as keyof typeof d]).toBeCloseTo(v, 9);
    }
  });
});
