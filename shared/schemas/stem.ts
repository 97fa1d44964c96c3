import { z } from 'zod';

export const stemRoles = ['kick', 'bass', 'other'] as const;
export const stemRoleSchema = z.enum(stemRoles);
export type StemRole = z.infer<typeof stemRoleSchema>;

/**
 * The form fields sent with an upload. `slot` names one stem of the song
 * ("808", "synth bass"); a new upload to the same slot is its next revision.
 * Without a slot, the role is the slot.
 */
export const stemUploadFieldsSchema = z.object({
  role: stemRoleSchema,
  slot: z
    .string()
    .trim()
    .min(1)
    .max(60)
    .regex(/^[\p{L}\p{N} ._'()#+-]+$/u, { message: 'Use letters, digits, spaces and . _ - \' ( ) # + only.' })
    .optional(),
});
export type StemUploadFields = z.infer<typeof stemUploadFieldsSchema>;

/** Suggests a role from a file name: "Kick_v2.wav" → kick, "808 main.wav" / "sub.wav" → bass (common practice, no source). */
export function suggestRole(fileName: string): StemRole {
  const name = fileName.toLowerCase();
  if (/\.(mid|midi)$/.test(name)) return 'kick';
  if (/(^|[^a-z])(kick|kik|kck|bd|bassdrum|bass drum)([^a-z]|$)/.test(name) || name.includes('kick')) return 'kick';
  if (/808|sub|bass|low ?end/.test(name)) return 'bass';
  return 'other';
}

export const stemSchema = z.object({
  id: z.string(),
  songId: z.string(),
  role: stemRoleSchema,
  slot: z.string(),
  revision: z.number().int(),
  isCurrent: z.boolean(),
  originalName: z.string(),
  format: z.enum(['wav', 'midi']),
  sampleRate: z.number().int().nullable(),
  bitDepth: z.number().int().nullable(),
  channels: z.number().int().nullable(),
  durationSec: z.number(),
  bytes: z.number().int(),
  sha256: z.string(),
  uploadedBy: z.object({ id: z.string(), displayName: z.string() }).nullable(),
  createdAt: z.string(),
});
export type Stem = z.infer<typeof stemSchema>;

/** GET …/stems/:stemId/overview: min/max peaks per bucket, interleaved, at a few zoom levels. */
export interface StemOverview {
  stemId: string;
  sampleRateHz: number;
  frames: number;
  durationSec: number;
  levels: { samplesPerBucket: number; peaks: number[] }[];
}
