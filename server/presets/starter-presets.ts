import type { PresetContentInput } from '../../shared/schemas/preset';

/**
 * Starter presets seeded into every new team. The values are common mixing
 * practice for ducking a sub under a kick in each style — common practice, no
 * source: short lead-ins of 2–5 ms, depths of −6 to −24 dB, holds about as long
 * as the kick's punch, recoveries of 60–200 ms. Teams are expected to tune them.
 */
export const starterPresets: PresetContentInput[] = [
  {
    name: 'Trap 808 tuck',
    genre: 'trap',
    notes: 'Deep and quick: the 808 ducks hard for the kick\'s click and body, then swells back before the next 16th.',
    shape: { points: [{ tMs: -3, gainDb: 0, curve: 'smooth' }, { tMs: 0, gainDb: -18 }, { tMs: 35, gainDb: -18, curve: 'smooth' }, { tMs: 120, gainDb: 0 }], slopeGuardMs: 5, floorDb: -60 },
    gateThresholdDbfs: -50,
  },
  {
    name: 'Drill slide keeper',
    genre: 'drill',
    notes: 'Shallower and shorter so sliding 808s keep their pitch movement audible.',
    shape: { points: [{ tMs: -2, gainDb: 0, curve: 'smooth' }, { tMs: 0, gainDb: -10 }, { tMs: 25, gainDb: -10, curve: 'smooth' }, { tMs: 90, gainDb: 0 }], slopeGuardMs: 5, floorDb: -60 },
    gateThresholdDbfs: -50,
  },
  {
    name: 'R&B soft pocket',
    genre: 'rnb',
    notes: 'Gentle: a few dB under a round kick, long smooth recovery so the bass never sounds pumped.',
    shape: { points: [{ tMs: -5, gainDb: 0, curve: 'smooth' }, { tMs: 0, gainDb: -6 }, { tMs: 40, gainDb: -6, curve: 'smooth' }, { tMs: 200, gainDb: 0 }], slopeGuardMs: 8, floorDb: -60 },
    gateThresholdDbfs: -50,
  },
  {
    name: 'Dembow sub tuck',
    genre: 'reggaeton',
    notes: 'For a sub that doubles the kick pattern: medium depth, recovery finished before the off-beat.',
    shape: { points: [{ tMs: -3, gainDb: 0, curve: 'smooth' }, { tMs: 0, gainDb: -12 }, { tMs: 30, gainDb: -12, curve: 'smooth' }, { tMs: 110, gainDb: 0 }], slopeGuardMs: 5, floorDb: -60 },
    gateThresholdDbfs: -50,
  },
  {
    name: 'Afrobeats log-drum space',
    genre: 'afrobeats',
    notes: 'Short and shallow so busy bass and log-drum lines keep moving around the kick.',
    shape: { points: [{ tMs: -2, gainDb: 0, curve: 'smooth' }, { tMs: 0, gainDb: -8 }, { tMs: 20, gainDb: -8, curve: 'smooth' }, { tMs: 80, gainDb: 0 }], slopeGuardMs: 5, floorDb: -60 },
    gateThresholdDbfs: -50,
  },
  {
    name: 'Boom bap thump',
    genre: 'boom-bap',
    notes: 'A long kick with a sampled bass: moderate depth held through the kick\'s boom.',
    shape: { points: [{ tMs: -4, gainDb: 0, curve: 'smooth' }, { tMs: 0, gainDb: -9 }, { tMs: 60, gainDb: -9, curve: 'smooth' }, { tMs: 180, gainDb: 0 }], slopeGuardMs: 8, floorDb: -60 },
    gateThresholdDbfs: -50,
  },
  {
    name: 'Pop tight low end',
    genre: 'pop',
    notes: 'Clean and controlled for a synth bass under a punchy kick.',
    shape: { points: [{ tMs: -3, gainDb: 0, curve: 'smooth' }, { tMs: 0, gainDb: -12 }, { tMs: 30, gainDb: -12, curve: 'smooth' }, { tMs: 130, gainDb: 0 }], slopeGuardMs: 5, floorDb: -60 },
    gateThresholdDbfs: -50,
  },
];
