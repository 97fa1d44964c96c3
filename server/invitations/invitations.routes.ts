import { Router } from 'express';
import { invitationAcceptSchema, invitationCreateSchema } from '../../shared/schemas/invitation';
import { issueToken, sessionCookie, setSessionCookie, verifyToken, type TokenSettings } from '../auth/session-token';
import type { AuthService } from '../auth/auth.service';
import { requirePermission, teamOf } from '../http/auth.middleware';
import { body } from '../http/validate';
import type { UsersRepository } from '../users/users.repository';
import type { InvitationsService } from './invitations.service';

/** `/api/teams/:teamId/invitations` (owners). */
export function teamInvitationsRoutes(deps: { invitations: InvitationsService }): Router {
  const router = Router({ mergeParams: true });
  const { invitations } = deps;
  const manage = requirePermission('manageMembers');
  router.get('/', manage, async (req, res) => {
    res.json(await invitations.list(teamOf(req).teamId));
  });
  router.post('/', manage, async (req, res) => {
    const { teamId, userId } = teamOf(req);
    const { email, role } = body(req, invitationCreateSchema);
    res.status(201).json(await invitations.invite(teamId, userId, email, role));
  });
  router.post('/:invitationId/resend', manage, async (req, res) => {
    const { teamId, userId } = teamOf(req);
    res.json(await invitations.resend(teamId, userId, String(req.params['invitationId'])));
  });
  router.delete('/:invitationId', manage, async (req, res) => {
    const { teamId, userId } = teamOf(req);
    await invitations.revoke(teamId, userId, String(req.params['invitationId']));
    res.status(204).end();
  });
  return router;
}

/** `/api/invitations/:token`: what the e-mailed link opens (no session needed). */
export function publicInvitationsRoutes(deps: { invitations: InvitationsService; auth: AuthService; users: UsersRepository; tokens: TokenSettings }): Router {
  const router = Router();
  const { invitations, tokens } = deps;
  router.get('/:token', async (req, res) => {
    res.json(await invitations.preview(String(req.params['token'])));
  });
  router.post('/:token/accept', async (req, res) => {
    const input = body(req, invitationAcceptSchema);
    // Signed in already? Then accepting adds that account to the team without asking for its password again.
    const cookie: unknown = req.cookies?.[sessionCookie];
    const signedInId = typeof cookie === 'string' ? verifyToken(cookie, tokens.secret) : undefined;
    const { userId, teamId } = await invitations.accept(String(req.params['token']), input, signedInId);
    const user = (await deps.users.findById(userId))!;
    setSessionCookie(res, issueToken(userId, tokens), tokens);
    res.json({ ...(await deps.auth.sessionOf(user)), joinedTeamId: teamId });
  });
  return router;
}
