import { z } from 'zod';
import { tuckShapeSchema, type TuckShapeInput } from './tuck-shape';

/**
 * A new lane's tuck: 4 ms lead-in, −18 dB for 40 ms, a 100 ms smooth recovery.
 * Values from common mixing practice for an 808 under a kick (common practice, no source).
 */
export const defaultLaneShape: TuckShapeInput = {
  points: [
    { tMs: -4, gainDb: 0, curve: 'smooth' },
    { tMs: 0, gainDb: -18 },
    { tMs: 40, gainDb: -18, curve: 'smooth' },
    { tMs: 140, gainDb: 0 },
  ],
  slopeGuardMs: 5,
  floorDb: -60,
};

const laneFields = {
  name: z.string().trim().min(1, { message: 'Name the lane.' }).max(80),
  bassSlot: z.string().trim().min(1).max(60).nullable(),
  shape: tuckShapeSchema,
  baseGainDb: z.number().min(-60).max(24),
  gateEnabled: z.boolean(),
  gateThresholdDbfs: z.number().min(-120).max(0),
  muted: z.boolean(),
  position: z.number().int().min(0).max(1000),
};

export const laneCreateSchema = z.object({
  name: laneFields.name,
  bassSlot: laneFields.bassSlot.default(null),
  shape: laneFields.shape.default(tuckShapeSchema.parse(defaultLaneShape)),
  baseGainDb: laneFields.baseGainDb.default(0),
  gateEnabled: laneFields.gateEnabled.default(true),
  gateThresholdDbfs: laneFields.gateThresholdDbfs.default(-50),
});
export type LaneCreate = z.input<typeof laneCreateSchema>;

/** A partial update. `revision` is the lane revision the client edited: a stale one answers 409. */
export const lanePatchSchema = z.object(laneFields).partial().extend({ revision: z.number().int().min(1).optional() });
export type LanePatch = z.input<typeof lanePatchSchema>;

export interface LaneDto {
  id: string;
  songId: string;
  name: string;
  position: number;
  bassSlot: string | null;
  shape: z.output<typeof tuckShapeSchema>;
  baseGainDb: number;
  gateEnabled: boolean;
  gateThresholdDbfs: number;
  muted: boolean;
  presetId: string | null;
  presetVersion: number | null;
  /** The preset's current version (a newer one than `presetVersion` exists when they differ). */
  presetLatestVersion?: number | null;
  presetName?: string | null;
  revision: number;
  updatedAt: string;
}
