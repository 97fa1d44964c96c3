import { z } from 'zod';

export const exportFormats = ['csv', 'midi', 'wav'] as const;
export const exportFormatSchema = z.enum(exportFormats);
export type ExportFormat = z.infer<typeof exportFormatSchema>;

/** POST …/exports. CSV and WAV are one lane per file; MIDI puts each lane on its own track. */
export const exportRequestSchema = z.object({
  format: exportFormatSchema,
  laneIds: z.array(z.uuid()).min(1, { message: 'Choose at least one lane.' }).max(32),
  options: z
    .object({
      cc: z.number().int().min(0).max(119).optional(),
      channel: z.number().int().min(1).max(16).optional(),
      ppq: z.number().int().min(24).max(32767).optional(),
      fourteenBit: z.boolean().optional(),
      markerTrack: z.boolean().optional(),
      sampleRate: z.number().int().min(8000).max(384000).optional(),
      /** WAV only: duck just the band below this crossover, Hz (GLOSSARY "Low-band tuck"; 120 Hz is the usual choice). */
      lowBandHz: z.number().min(30).max(500).optional(),
    })
    .default({}),
});
export type ExportRequest = z.input<typeof exportRequestSchema>;

export interface ExportDto {
  id: string;
  songId: string;
  format: ExportFormat;
  laneIds: string[];
  options: Record<string, unknown>;
  fileName: string;
  bytes: number;
  createdBy: { id: string; displayName: string } | null;
  createdAt: string;
  downloadUrl: string;
}
