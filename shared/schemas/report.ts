import type { HeadroomResult } from '../dsp/headroom-report';

/** GET …/songs/:songId/report (GLOSSARY "Headroom report", "Phase check"). */
export interface HeadroomReportDto extends HeadroomResult {
  songId: string;
  sampleRateHz: number;
  durationSec: number;
  computedAt: string;
}
