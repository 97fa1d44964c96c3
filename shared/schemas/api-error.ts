import { z } from 'zod';

/** The one error shape every API response uses: `{"error":{"code","message","details"}}`. */
export const apiErrorSchema = z.object({
  error: z.object({
    code: z.string(),
    message: z.string(),
    details: z.unknown().optional(),
  }),
});
export type ApiError = z.infer<typeof apiErrorSchema>;
