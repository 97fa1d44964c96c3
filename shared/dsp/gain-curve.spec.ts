import { describe, expect, it } from 'vitest';
import { curveArrays, packedCurve } from './gain-curve';

describe('packedCurve', () => {
  const arrays = () => ({ timeSec: Float64Array.of(0, 0.5, 1), gainDb: Float64Array.of(-2, -42, -2) });
  const plain = { points: [{ timeSec: 0, gainDb: -2 }, { timeSec: 0.5, gainDb: -42 }, { timeSec: 1, gainDb: -2 }], baseGainDb: -2, floorDb: -60 };

  it('reads as the plain curve of the same points: JSON, spread, structured clone (known by construction)', () => {
    expect(packedCurve(arrays(), -2, -60).points).toEqual(plain.points);
    expect(JSON.stringify(packedCurve(arrays(), -2, -60))).toBe(JSON.stringify(plain));
    expect({ ...packedCurve(arrays(), -2, -60) }).toEqual(plain);
    expect(structuredClone(packedCurve(arrays(), -2, -60))).toEqual(plain);
  });

  it('hands its own arrays to curveArrays until its points are read, then follows the points', () => {
    const a = arrays();
    const curve = packedCurve(a, -2, -60);
    expect(curveArrays(curve).timeSec).toBe(a.timeSec);
    curve.points[1].gainDb = -30;
    expect(Array.from(curveArrays(curve).gainDb)).toEqual([-2, -30, -2]);
    curve.points = [{ timeSec: 0, gainDb: 0 }];
    expect(Array.from(curveArrays(curve).timeSec)).toEqual([0]);
  });

  it('takes points assigned before any were read', () => {
    const curve = packedCurve(arrays(), -2, -60);
    curve.points = [{ timeSec: 2, gainDb: -6 }];
    expect(Array.from(curveArrays(curve).gainDb)).toEqual([-6]);
    expect(curve.points).toEqual([{ timeSec: 2, gainDb: -6 }]);
  });

  it('copies the points of a plain curve', () => {
    const { timeSec, gainDb } = curveArrays(plain);
    expect(Array.from(timeSec)).toEqual([0, 0.5, 1]);
    expect(Array.from(gainDb)).toEqual([-2, -42, -2]);
  });
});
