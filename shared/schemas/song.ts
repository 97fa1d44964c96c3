import { z } from 'zod';

export const timeSignatureSchema = z.object({
  beats: z.number().int().min(1).max(32),
  beatUnit: z.union([z.literal(2), z.literal(4), z.literal(8), z.literal(16)]),
});
export type TimeSignature = z.infer<typeof timeSignatureSchema>;

const songFields = {
  title: z.string().trim().min(1, { message: 'Give the song a title.' }).max(120),
  artistAlias: z.string().trim().max(120),
  bpm: z.number({ message: 'Enter the tempo in BPM.' }).min(20, { message: 'Tempo must be 20–400 BPM.' }).max(400, { message: 'Tempo must be 20–400 BPM.' }),
  timeSignature: timeSignatureSchema,
  notes: z.string().max(4000),
};

export const songInputSchema = z.object({
  ...songFields,
  artistAlias: songFields.artistAlias.default(''),
  timeSignature: songFields.timeSignature.default({ beats: 4, beatUnit: 4 }),
  notes: songFields.notes.default(''),
});
export type SongInput = z.input<typeof songInputSchema>;
/** A partial update: absent fields stay as stored (no defaults here on purpose). */
export const songPatchSchema = z.object(songFields).partial();

export const songSchema = z.object({
  id: z.string(),
  teamId: z.string(),
  title: z.string(),
  artistAlias: z.string(),
  bpm: z.number(),
  timeSignature: timeSignatureSchema,
  notes: z.string(),
  createdBy: z.object({ id: z.string(), displayName: z.string() }).nullable(),
  stemCount: z.number().int(),
  hitCount: z.number().int().nullable(),
  createdAt: z.string(),
  updatedAt: z.string(),
});
export type Song = z.infer<typeof songSchema>;

export const songSortKeys = ['title', 'artistAlias', 'bpm', 'updatedAt', 'createdAt'] as const;
export const songListQuerySchema = z.object({
  q: z.string().trim().max(120).optional(),
  sort: z.enum(songSortKeys).default('updatedAt'),
  order: z.enum(['asc', 'desc']).default('desc'),
  page: z.coerce.number().int().min(0).default(0),
  pageSize: z.coerce.number().int().min(1).max(100).default(25),
});
export type SongListQuery = z.infer<typeof songListQuerySchema>;

export const songListSchema = z.object({ items: z.array(songSchema), total: z.number().int() });
export type SongList = z.infer<typeof songListSchema>;
