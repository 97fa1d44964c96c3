import { z } from 'zod';
import { tuckShapeSchema } from './tuck-shape';

/** Genres offered first in the UI; any other short name is allowed too. */
export const suggestedGenres = ['trap', 'drill', 'rnb', 'reggaeton', 'afrobeats', 'boom-bap', 'pop', 'dancehall', 'amapiano'] as const;

export const genreSchema = z
  .string()
  .trim()
  .toLowerCase()
  .min(1, { message: 'Choose a genre.' })
  .max(40)
  .regex(/^[a-z0-9][a-z0-9 &'-]*$/, { message: 'Use letters, digits, spaces, - & or \' for the genre.' });

export const presetStatuses = ['draft', 'published', 'retired'] as const;
export const presetStatusSchema = z.enum(presetStatuses);
export type PresetStatus = z.infer<typeof presetStatusSchema>;

/** What a preset version holds: the tuck shape with its defaults (GLOSSARY "Preset"). */
export const presetContentSchema = z.object({
  name: z.string().trim().min(1, { message: 'Name the preset.' }).max(80),
  genre: genreSchema,
  notes: z.string().max(2000).default(''),
  shape: tuckShapeSchema,
  gateThresholdDbfs: z.number().min(-120).max(0).default(-50),
});
export type PresetContent = z.output<typeof presetContentSchema>;
export type PresetContentInput = z.input<typeof presetContentSchema>;

/** A save: the version the editor started from, and what changed. A stale `version` answers 409. */
export const presetSaveSchema = presetContentSchema.partial().extend({ version: z.number().int().min(1) });
export type PresetSave = z.input<typeof presetSaveSchema>;

export const presetSortKeys = ['name', 'genre', 'updatedAt', 'useCount'] as const;
export const presetListQuerySchema = z.object({
  genre: genreSchema.optional(),
  q: z.string().trim().max(120).optional(),
  status: presetStatusSchema.optional(),
  sort: z.enum(presetSortKeys).default('name'),
  order: z.enum(['asc', 'desc']).default('asc'),
});

export interface PresetDto {
  id: string;
  teamId: string;
  name: string;
  genre: string;
  notes: string;
  status: PresetStatus;
  version: number;
  useCount: number;
  shape: z.output<typeof tuckShapeSchema>;
  gateThresholdDbfs: number;
  author: { id: string; displayName: string } | null;
  createdAt: string;
  updatedAt: string;
}

export interface PresetVersionDto {
  version: number;
  content: PresetContent;
  savedBy: { id: string; displayName: string } | null;
  savedAt: string;
}

/**
 * Tuckline's preset file (docs/preset-format.md). `format` and `formatVersion`
 * identify it; unknown versions are refused rather than guessed at.
 */
export const presetFileFormat = 'tuckline.presets';
export const presetFileVersion = 1;
export const presetFileSchema = z.object({
  format: z.literal(presetFileFormat, { message: `Not a Tuckline preset file (expected "format": "${presetFileFormat}").` }),
  formatVersion: z.literal(presetFileVersion, { message: `Unsupported preset file version (this Tuckline reads version ${presetFileVersion}).` }),
  exportedAt: z.string().max(40).optional(),
  presets: z.array(presetContentSchema).min(1, { message: 'The file holds no presets.' }).max(200, { message: 'A preset file may hold at most 200 presets.' }),
});
export type PresetFile = z.input<typeof presetFileSchema>;

export const applyPresetSchema = z.object({ presetId: z.uuid() });
export const presetFromLaneSchema = z.object({
  songId: z.uuid(),
  laneId: z.uuid(),
  name: presetContentSchema.shape.name,
  genre: genreSchema,
  notes: z.string().max(2000).default(''),
});
