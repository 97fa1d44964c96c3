import { z } from 'zod';
import { emailSchema, passwordSchema } from './auth';
import { roleSchema } from './team';

export const invitationCreateSchema = z.object({ email: emailSchema, role: roleSchema });

/** Accepting: a new account gives a name and password; an existing one its password (or is signed in already). */
export const invitationAcceptSchema = z.object({
  displayName: z.string().trim().min(1).max(80).optional(),
  password: z.string().min(1).max(200).optional(),
});

export interface InvitationDto {
  id: string;
  email: string;
  role: z.infer<typeof roleSchema>;
  invitedBy: { id: string; displayName: string } | null;
  expiresAt: string;
  createdAt: string;
  status: 'pending' | 'expired';
}

export interface InvitationPreview {
  teamName: string;
  email: string;
  role: z.infer<typeof roleSchema>;
  invitedBy: string | null;
  expiresAt: string;
  accountExists: boolean;
}

export const passwordResetRequestSchema = z.object({ email: emailSchema });
export const passwordResetConfirmSchema = z.object({ token: z.string().min(20).max(200), password: passwordSchema });

export const auditQuerySchema = z.object({
  action: z.string().max(60).optional(),
  actorId: z.uuid().optional(),
  from: z.iso.datetime({ offset: true }).optional(),
  to: z.iso.datetime({ offset: true }).optional(),
  page: z.coerce.number().int().min(0).default(0),
  pageSize: z.coerce.number().int().min(1).max(200).default(50),
});

export const teamSettingsSchema = z.object({
  defaultExport: z
    .object({
      cc: z.number().int().min(0).max(119).default(11),
      channel: z.number().int().min(1).max(16).default(1),
      ppq: z.number().int().min(24).max(32767).default(960),
      fourteenBit: z.boolean().default(false),
    })
    .default({ cc: 11, channel: 1, ppq: 960, fourteenBit: false }),
  defaultPresetByGenre: z.record(z.string().max(40), z.uuid()).default({}),
});
export type TeamSettings = z.output<typeof teamSettingsSchema>;
export const teamSettingsPatchSchema = z.object({
  name: z.string().trim().min(1).max(80).optional(),
  defaultExport: teamSettingsSchema.shape.defaultExport.unwrap().partial().optional(),
  defaultPresetByGenre: z.record(z.string().max(40), z.uuid().nullable()).optional(),
});
