import { z } from 'zod';
import { detectionOptionsSchema, midiKickOptionsSchema } from './hit';

export const detectRequestSchema = z.object({
  detection: detectionOptionsSchema.partial().optional(),
  midi: midiKickOptionsSchema.partial().optional(),
});
export type DetectRequest = z.infer<typeof detectRequestSchema>;

/** One batch of edits to a hit map; applied in one transaction. */
export const hitEditSchema = z
  .object({
    update: z
      .array(
        z.object({
          id: z.uuid(),
          enabled: z.boolean().optional(),
          depthDb: z.number().min(-120).max(0).nullable().optional(),
        }),
      )
      .max(20_000)
      .optional(),
    add: z.array(z.object({ timeSec: z.number().min(0).max(3600), strength: z.number().min(0).max(1).default(1) })).max(1000).optional(),
    remove: z.array(z.uuid()).max(20_000).optional(),
    /** Turns every hit in [fromSec, toSec] on or off (bars where no bass plays). */
    range: z
      .object({ fromSec: z.number().min(0), toSec: z.number().min(0), enabled: z.boolean() })
      .refine((r) => r.toSec >= r.fromSec, { message: 'The range must end after it starts.', path: ['toSec'] })
      .optional(),
  })
  .refine((e) => e.update || e.add || e.remove || e.range, { message: 'Send at least one of update, add, remove or range.' });
export type HitEdit = z.input<typeof hitEditSchema>;

export const storedHitSchema = z.object({
  id: z.string(),
  position: z.number().int(),
  timeSec: z.number(),
  sample: z.number().int().optional(),
  strength: z.number(),
  enabled: z.boolean(),
  depthDb: z.number().nullable().optional(),
  origin: z.enum(['detected', 'added']),
});
export type StoredHitDto = z.infer<typeof storedHitSchema>;

export interface HitMapDto {
  id: string;
  songId: string;
  sourceStemId: string | null;
  detection: Record<string, unknown>;
  revisionSummary: {
    added: number[];
    removed: number[];
    moved: [number, number][];
    editsCarried: number;
    toleranceMs: number;
  } | null;
  updatedAt: string;
  hits: StoredHitDto[];
}
