import type { RequestHandler } from 'express';
import { z } from 'zod';
import { can, type Permission } from '../../shared/schemas/team';
import { sessionCookie, verifyToken } from '../auth/session-token';
import type { TeamsRepository } from '../teams/teams.repository';
import type { UsersRepository } from '../users/users.repository';
import { forbidden, notFound, unauthorized } from './errors';
import './request-context';

const uuid = z.uuid();

export function requireSession(deps: { users: UsersRepository; secret: string }): RequestHandler {
  return async (req, _res, next) => {
    const token: unknown = req.cookies?.[sessionCookie];
    if (typeof token !== 'string' || !token) throw unauthorized();
    const userId = verifyToken(token, deps.secret);
    if (!userId) throw unauthorized('auth.invalid_session', 'Your session has expired or is not valid. Sign in again.');
    const user = await deps.users.findById(userId);
    if (!user) throw unauthorized('auth.invalid_session', 'Your session has expired or is not valid. Sign in again.');
    req.user = { id: user.id, email: user.email, displayName: user.displayName };
    next();
  };
}

/** Loads the caller's membership of `:teamId`. Not a member (or no such team) answers 404, so ids do not leak. */
export function requireTeam(deps: { teams: TeamsRepository }): RequestHandler {
  return async (req, _res, next) => {
    const teamId = req.params['teamId'];
    const missing = notFound('teams.not_found', 'That team does not exist or you are not a member of it.');
    if (!req.user || typeof teamId !== 'string' || !uuid.safeParse(teamId).success) throw missing;
    const membership = await deps.teams.membership(teamId, req.user.id);
    if (!membership) throw missing;
    req.team = { teamId, role: membership.role };
    next();
  };
}

export function requirePermission(permission: Permission): RequestHandler {
  return (req, _res, next) => {
    if (!req.team || !can(req.team.role, permission)) throw forbidden();
    next();
  };
}

/** The team context of a request that passed requireTeam. */
export function teamOf(req: Parameters<RequestHandler>[0]) {
  if (!req.team || !req.user) throw unauthorized();
  return { ...req.team, userId: req.user.id };
}
