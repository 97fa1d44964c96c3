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
