import { PresetDto } from '../../shared/schemas/preset';

/** A preset as the API returns it, in the demo team. */
export function presetDto(over: Partial<PresetDto> = {}): PresetDto {
  return {
    id: 'p-trap',
    teamId: 't-salt',
    name: 'Trap 808 tuck',
    genre: 'trap',
    notes: 'Deep and quick.',
    status: 'published',
    version: 2,
    useCount: 4,
    shape: { points: [{ tMs: -3, gainDb: 0, curve: 'smooth' }, { tMs: 0, gainDb: -18 }, { tMs: 35, gainDb: -18, curve: 'smooth' }, { tMs: 120, gainDb: 0 }], slopeGuardMs: 5, depthDb: null, floorDb: -60 },
    gateThresholdDbfs: -50,
    author: { id: 'u-owner', displayName: 'Demo owner' },
    createdAt: '2026-11-30T10:00:00.000Z',
    updatedAt: '2026-11-30T12:00:00.000Z',
    ...over,
  };
}
