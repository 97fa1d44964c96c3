import type { SignInRequest, SignUpRequest } from '../../shared/schemas/auth';
import type { Audit } from '../audit/audit.service';
import type { Database } from '../db/client';
import { unauthorized } from '../http/errors';
import type { TeamsRepository } from '../teams/teams.repository';
import type { UsersRepository } from '../users/users.repository';
import { decoyHash, hashPassword, verifyPassword } from './passwords';

export const invalidCredentials = () =>
  unauthorized('auth.invalid_credentials', 'That e-mail and password do not match an account.');

export function createAuthService(deps: { db: Database; users: UsersRepository; teams: TeamsRepository; audit: Audit }) {
  const { db, users, teams, audit } = deps;

  async function sessionOf(user: { id: string; email: string; displayName: string }) {
    return {
      user: { id: user.id, email: user.email, displayName: user.displayName },
      teams: await teams.teamsOf(user.id),
    };
  }

  return {
    sessionOf,

    /** Creates the account and its own team (as owner) in one transaction. */
    async signUp(input: SignUpRequest) {
      const passwordHash = await hashPassword(input.password);
      const user = await db.transaction(async (tx) => {
        const created = await users.create({ email: input.email, displayName: input.displayName, passwordHash }, tx);
        const team = await teams.create(input.teamName ?? `${input.displayName}'s team`, created.id, tx);
        await audit.record({ teamId: team.id, actorId: created.id, action: 'auth.sign_up' }, tx);
        return created;
      });
      return sessionOf(user);
    },

    /** The same answer for an unknown e-mail and a wrong password, after the same bcrypt work. */
    async signIn(input: SignInRequest) {
      const user = await users.findByEmail(input.email);
      const ok = await verifyPassword(input.password, user?.passwordHash ?? decoyHash);
      if (!user || !ok) throw invalidCredentials();
      await users.touchSignIn(user.id);
      const session = await sessionOf(user);
      for (const team of session.teams) await audit.record({ teamId: team.id, actorId: user.id, action: 'auth.sign_in' });
      return session;
    },
  };
}
export type AuthService = ReturnType<typeof createAuthService>;
