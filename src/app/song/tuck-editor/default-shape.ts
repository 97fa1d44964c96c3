import type { TuckShapeInput } from '../../../../shared/schemas/tuck-shape';
import { defaultLaneShape } from '../../../../shared/schemas/lane';

/** A new lane's tuck until the server gives one: the server's own default lane shape (shared/schemas/lane.ts). */
export const defaultShape: TuckShapeInput = defaultLaneShape;
