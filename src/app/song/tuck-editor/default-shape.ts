import { TuckShapeInput } from '../../../../shared/schemas/tuck-shape';

/**
 * A new lane's tuck until the server gives one: 4 ms lead-in, −18 dB held for
 * 40 ms, a 100 ms smooth recovery (common mixing practice for an 808 under a
 * kick, no source; the same as the server's default lane shape).
 */
export const defaultShape: TuckShapeInput = {
  points: [
    { tMs: -4, gainDb: 0, curve: 'smooth' },
    { tMs: 0, gainDb: -18 },
    { tMs: 40, gainDb: -18, curve: 'smooth' },
    { tMs: 140, gainDb: 0 },
  ],
  slopeGuardMs: 5,
  floorDb: -60,
};
