import type { LevelFigures } from '../dsp/headroom';
import type { HitPhase, PhaseSuggestion } from '../dsp/phase-check';

export interface BeforeAfter {
  before: LevelFigures;
  after: LevelFigures;
}

/** GET …/songs/:songId/report (GLOSSARY "Headroom report", "Phase check"). */
export interface HeadroomReportDto {
  songId: string;
  sampleRateHz: number;
  durationSec: number;
  lanes: ({ laneId: string; name: string } & BeforeAfter)[];
  /** Kick plus every unmuted lane's bass. */
  sum: BeforeAfter;
  /** Sample-peak and true-peak reduction of the sum, dB (positive = headroom gained). */
  headroomGainedDb: { samplePeak: number; truePeak: number };
  perHit: { hitId: string; timeSec: number; beforeDbfs: number; afterDbfs: number }[];
  phase: { laneId: string; hits: (HitPhase & { hitId: string })[]; suggestion: PhaseSuggestion } | null;
  computedAt: string;
}
