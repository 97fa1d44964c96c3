/**
 * The stamped result for one lane (GLOSSARY "Gain curve"): breakpoints across
 * the whole song, ascending in time, joined by straight lines in dB.
 *
 * A curve straight out of `stampHits` is the *true* curve: its smooth ramps
 * are sampled finely enough (see `SMOOTH_RAMP_TOLERANCE_DB` in slope-guard.ts)
 * that linear-in-dB interpolation is the ramp within 0.005 dB. Exports thin it
 * (curve-thin.ts); renders use it as it is.
 */
export interface GainPoint {
  /** Seconds from the start of the song. */
  timeSec: number;
  /** Gain in dB (0 dB = unity), never below the curve's floor. */
  gainDb: number;
}

export interface GainCurve {
  points: GainPoint[];
  /** The lane's gain outside tucks, dB (GLOSSARY "Base gain"). */
  baseGainDb?: number;
  /** The lowest gain written, dB; exporters write silence (MIDI value 0) there. */
  floorDb?: number;
}

/**
 * A curve's breakpoints as two arrays of one length: seconds ascending, and
 * dB. Stamping, thinning, the writers and the renderers work on these; a song's
 * curve has tens of thousands of points, and as objects each of their doubles
 * would be a separate heap allocation (a scavenge copies them all while the
 * curve is alive).
 */
export interface CurveArrays {
  timeSec: Float64Array;
  gainDb: Float64Array;
}

/** The arrays of curves made by `packedCurve` whose points nobody has read yet. */
const packed = new WeakMap<GainCurve, CurveArrays>();

/**
 * A gain curve held as arrays. Its `points` are made on first read (for the
 * API, the browser and tests, which want objects) and from then on are the
 * curve: the arrays are dropped, so a change made to a point is never missed.
 * `points` is an own enumerable property, so JSON, a structured clone and a
 * spread see the points as they would on a plain curve.
 */
export function packedCurve(arrays: CurveArrays, baseGainDb: number | undefined, floorDb: number | undefined): GainCurve {
  const curve: GainCurve = {
    get points(): GainPoint[] {
      const points: GainPoint[] = new Array(arrays.timeSec.length);
      for (let i = 0; i < points.length; i++) points[i] = { timeSec: arrays.timeSec[i], gainDb: arrays.gainDb[i] };
      setPoints(curve, points);
      return points;
    },
    set points(points: GainPoint[]) {
      setPoints(curve, points);
    },
    baseGainDb,
    floorDb,
  };
  packed.set(curve, arrays);
  return curve;
}

function setPoints(curve: GainCurve, points: GainPoint[]): void {
  packed.delete(curve);
  Object.defineProperty(curve, 'points', { value: points, writable: true, enumerable: true, configurable: true });
}

/**
 * The curve's breakpoints as arrays: those of a `packedCurve` whose points were
 * never read (shared, not copied: never write to them), else copied from `points`.
 */
export function curveArrays(curve: GainCurve): CurveArrays {
  const arrays = packed.get(curve);
  if (arrays) return arrays;
  const p = curve.points;
  const timeSec = new Float64Array(p.length);
  const gainDb = new Float64Array(p.length);
  for (let i = 0; i < p.length; i++) {
    timeSec[i] = p[i].timeSec;
    gainDb[i] = p[i].gainDb;
  }
  return { timeSec, gainDb };
}

/** The result of stamping one lane. */
export interface StampResult {
  curve: GainCurve;
  /** Indexes (into the caller's hits array) of enabled hits the bass gate skipped. */
  gatedHitIndexes: number[];
  /** How many hits got a tuck. */
  stampedHitCount: number;
}

/** A tuck template: one guarded tuck relative to its hit, dB relative to the base gain. */
export interface TuckTemplate {
  /** Milliseconds relative to the hit, ascending (may repeat at a floor split). */
  tMs: Float64Array;
  /** dB relative to the base gain, ≤ 0. */
  gainDb: Float64Array;
  /** First and last time of the tuck, ms relative to the hit. */
  startMs: number;
  endMs: number;
}
