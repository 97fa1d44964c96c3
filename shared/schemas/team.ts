import { z } from 'zod';

export const roles = ['owner', 'engineer', 'assistant'] as const;
export const roleSchema = z.enum(roles);
export type Role = z.infer<typeof roleSchema>;

/** What each role may do; the server checks these on every route and the client hides what a role cannot do. */
export const permissions = {
  manageMembers: ['owner'],
  manageTeam: ['owner'],
  editSongs: ['owner', 'engineer', 'assistant'],
  deleteSongs: ['owner', 'engineer'],
  prepareSongs: ['owner', 'engineer', 'assistant'],
  editLanes: ['owner', 'engineer', 'assistant'],
  export: ['owner', 'engineer', 'assistant'],
  editPresets: ['owner', 'engineer'],
  viewAudit: ['owner'],
} as const satisfies Record<string, readonly Role[]>;
export type Permission = keyof typeof permissions;

export function can(role: Role, permission: Permission): boolean {
  return (permissions[permission] as readonly Role[]).includes(role);
}

export const teamNameSchema = z.string().trim().min(1, { message: 'Enter a team name.' }).max(80);
export const createTeamSchema = z.object({ name: teamNameSchema });
export const updateTeamSchema = z.object({ name: teamNameSchema });

export const memberSchema = z.object({
  userId: z.string(),
  email: z.string(),
  displayName: z.string(),
  role: roleSchema,
  joinedAt: z.string(),
});
export type Member = z.infer<typeof memberSchema>;

export const updateMemberSchema = z.object({ role: roleSchema });
