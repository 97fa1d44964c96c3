import { and, desc, eq, gt, isNull } from 'drizzle-orm';
import type { InvitationDto, InvitationPreview } from '../../shared/schemas/invitation';
import type { Role } from '../../shared/schemas/team';
import type { Audit } from '../audit/audit.service';
import { hashOneTimeToken, newOneTimeToken } from '../auth/one-time-token';
import { hashPassword, verifyPassword } from '../auth/passwords';
import type { Database } from '../db/client';
import { badRequest, conflict, notFound, unauthorized } from '../http/errors';
import type { Mailer } from '../mail/mailer';
import { invitationMail } from '../mail/messages';
import { memberships, teams } from '../teams/teams.table';
import type { TeamsRepository } from '../teams/teams.repository';
import { users } from '../users/users.table';
import type { UsersRepository } from '../users/users.repository';
import { invitations } from './invitations.table';

/** Invitations stay valid for 7 days. */
export const invitationLifetimeMs = 7 * 86_400_000;

const linkGone = () => notFound('invitations.invalid', 'This invitation link is not valid any more: it was used, revoked or replaced. Ask the team owner for a new one.');

export function createInvitationsService(deps: { db: Database; mailer: Mailer; publicUrl: string; teams: TeamsRepository; users: UsersRepository; audit: Audit; now?: () => Date }) {
  const { db, mailer, audit } = deps;
  const now = deps.now ?? (() => new Date());

  async function send(teamId: string, invitationId: string, token: string) {
    const [row] = await db
      .select({ inv: invitations, teamName: teams.name, inviter: users.displayName })
      .from(invitations)
      .innerJoin(teams, eq(teams.id, invitations.teamId))
      .leftJoin(users, eq(users.id, invitations.invitedBy))
      .where(and(eq(invitations.teamId, teamId), eq(invitations.id, invitationId)));
    await mailer.send(
      invitationMail({ to: row.inv.email, teamName: row.teamName, inviter: row.inviter ?? 'A team owner', role: row.inv.role, link: `${deps.publicUrl}/invitations/${token}`, expiresAt: row.inv.expiresAt }),
    );
  }

  function toDto(row: typeof invitations.$inferSelect, inviterName: string | null): InvitationDto {
    return {
      id: row.id,
      email: row.email,
      role: row.role,
      invitedBy: row.invitedBy ? { id: row.invitedBy, displayName: inviterName ?? '' } : null,
      expiresAt: row.expiresAt.toISOString(),
      createdAt: row.createdAt.toISOString(),
      status: row.expiresAt > now() ? 'pending' : 'expired',
    };
  }

  async function findOpen(token: string) {
    const [row] = await db
      .select({ inv: invitations, teamName: teams.name, inviter: users.displayName })
      .from(invitations)
      .innerJoin(teams, eq(teams.id, invitations.teamId))
      .leftJoin(users, eq(users.id, invitations.invitedBy))
      .where(and(eq(invitations.tokenHash, hashOneTimeToken(token)), isNull(invitations.acceptedAt), isNull(invitations.revokedAt)));
    if (!row) throw linkGone();
    if (row.inv.expiresAt <= now()) throw badRequest('invitations.expired', 'This invitation has expired. Ask the team owner to send it again.');
    return row;
  }

  return {
    async list(teamId: string): Promise<InvitationDto[]> {
      const rows = await db
        .select({ inv: invitations, inviter: users.displayName })
        .from(invitations)
        .leftJoin(users, eq(users.id, invitations.invitedBy))
        .where(and(eq(invitations.teamId, teamId), isNull(invitations.acceptedAt), isNull(invitations.revokedAt)))
        .orderBy(desc(invitations.createdAt));
      return rows.map((r) => toDto(r.inv, r.inviter));
    },

    async invite(teamId: string, actorId: string, email: string, role: Role): Promise<InvitationDto> {
      const [member] = await db
        .select({ id: users.id })
        .from(users)
        .innerJoin(memberships, and(eq(memberships.userId, users.id), eq(memberships.teamId, teamId)))
        .where(eq(users.email, email));
      if (member) throw conflict('invitations.already_member', 'That person is already in this team.');
      const [pending] = await db
        .select({ id: invitations.id })
        .from(invitations)
        .where(and(eq(invitations.teamId, teamId), eq(invitations.email, email), isNull(invitations.acceptedAt), isNull(invitations.revokedAt), gt(invitations.expiresAt, now())));
      if (pending) throw conflict('invitations.pending', 'That address already has a pending invitation. Resend it instead.');
      const { token, hash } = newOneTimeToken();
      const [row] = await db
        .insert(invitations)
        .values({ teamId, email, role, tokenHash: hash, invitedBy: actorId, expiresAt: new Date(now().getTime() + invitationLifetimeMs) })
        .returning();
      await send(teamId, row.id, token);
      await audit.record({ teamId, actorId, action: 'invitation.sent', subjectType: 'invitation', subjectId: row.id, details: { email, role } });
      return (await this.list(teamId)).find((i) => i.id === row.id)!;
    },

    /** A new token and a new expiry; the old link stops working. */
    async resend(teamId: string, actorId: string, invitationId: string): Promise<InvitationDto> {
      const { token, hash } = newOneTimeToken();
      const [row] = await db
        .update(invitations)
        .set({ tokenHash: hash, expiresAt: new Date(now().getTime() + invitationLifetimeMs) })
        .where(and(eq(invitations.teamId, teamId), eq(invitations.id, invitationId), isNull(invitations.acceptedAt), isNull(invitations.revokedAt)))
        .returning();
      if (!row) throw notFound('invitations.not_found', 'That invitation is not pending in this team.');
      await send(teamId, row.id, token);
      await audit.record({ teamId, actorId, action: 'invitation.resent', subjectType: 'invitation', subjectId: row.id, details: { email: row.email } });
      return (await this.list(teamId)).find((i) => i.id === row.id)!;
    },

    async revoke(teamId: string, actorId: string, invitationId: string): Promise<void> {
      const [row] = await db
        .update(invitations)
        .set({ revokedAt: now() })
        .where(and(eq(invitations.teamId, teamId), eq(invitations.id, invitationId), isNull(invitations.acceptedAt), isNull(invitations.revokedAt)))
        .returning();
      if (!row) throw notFound('invitations.not_found', 'That invitation is not pending in this team.');
      await audit.record({ teamId, actorId, action: 'invitation.revoked', subjectType: 'invitation', subjectId: row.id, details: { email: row.email } });
    },

    async preview(token: string): Promise<InvitationPreview> {
      const row = await findOpen(token);
      const account = await deps.users.findByEmail(row.inv.email);
      return { teamName: row.teamName, email: row.inv.email, role: row.inv.role, invitedBy: row.inviter, expiresAt: row.inv.expiresAt.toISOString(), accountExists: !!account };
    },

    /**
     * Accepts once: creates the account (new address) or adds the membership
     * (existing account: signed in as it, or its password). The invitation is
     * marked used in the same transaction, guarded so a second use finds nothing.
     */
    async accept(token: string, input: { displayName?: string; password?: string }, signedInUserId?: string): Promise<{ userId: string; teamId: string }> {
      const row = await findOpen(token);
      const email = row.inv.email;
      const existing = await deps.users.findByEmail(email);
      let passwordHash: string | undefined;
      if (existing) {
        const ok = signedInUserId === existing.id || (input.password ? await verifyPassword(input.password, existing.passwordHash) : false);
        if (!ok) throw unauthorized('invitations.sign_in_required', `An account for ${email} exists. Sign in as it, or enter its password, to accept.`);
      } else {
        if (!input.displayName || !input.password || input.password.length < 10) {
          throw badRequest('request.invalid', 'Enter your name and a password of at least 10 characters to create your account.');
        }
        passwordHash = await hashPassword(input.password);
      }
      return db.transaction(async (tx) => {
        const [used] = await tx
          .update(invitations)
          .set({ acceptedAt: now() })
          .where(and(eq(invitations.id, row.inv.id), isNull(invitations.acceptedAt), isNull(invitations.revokedAt)))
          .returning();
        if (!used) throw linkGone();
        const userId = existing ? existing.id : (await deps.users.create({ email, displayName: input.displayName!, passwordHash: passwordHash! }, tx)).id;
        await deps.teams.addMember(row.inv.teamId, userId, row.inv.role, tx);
        await audit.record({ teamId: row.inv.teamId, actorId: userId, action: 'invitation.accepted', subjectType: 'invitation', subjectId: row.inv.id, details: { email, role: row.inv.role } }, tx);
        return { userId, teamId: row.inv.teamId };
      });
    },
  };
}
export type InvitationsService = ReturnType<typeof createInvitationsService>;
