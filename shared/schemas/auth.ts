import { z } from 'zod';
import { roleSchema } from './team';

export const emailSchema = z.string().trim().toLowerCase().pipe(z.email({ message: 'Enter a valid e-mail address.' })).pipe(z.string().max(254));

/** At least 10 characters: long enough to resist guessing, short enough to type (NIST SP 800-63B asks for 8 or more). */
export const passwordSchema = z
  .string()
  .min(10, { message: 'Use at least 10 characters.' })
  .max(200, { message: 'Use at most 200 characters.' });

export const signUpSchema = z.object({
  email: emailSchema,
  password: passwordSchema,
  displayName: z.string().trim().min(1, { message: 'Enter your name.' }).max(80),
  teamName: z.string().trim().min(1).max(80).optional(),
});
export type SignUpRequest = z.infer<typeof signUpSchema>;

export const signInSchema = z.object({
  email: emailSchema,
  password: z.string().min(1, { message: 'Enter your password.' }).max(200),
});
export type SignInRequest = z.infer<typeof signInSchema>;

export const userSchema = z.object({
  id: z.string(),
  email: z.string(),
  displayName: z.string(),
});
export type User = z.infer<typeof userSchema>;

export const teamMembershipSchema = z.object({
  id: z.string(),
  name: z.string(),
  role: roleSchema,
});
export type TeamMembership = z.infer<typeof teamMembershipSchema>;

/** What `GET /api/auth/me`, sign-in and sign-up return. */
export const sessionSchema = z.object({
  user: userSchema,
  teams: z.array(teamMembershipSchema),
});
export type Session = z.infer<typeof sessionSchema>;
