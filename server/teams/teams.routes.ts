import { Router, type RequestHandler } from 'express';
import { createTeamSchema, updateMemberSchema, updateTeamSchema } from '../../shared/schemas/team';
import { teamSettingsPatchSchema } from '../../shared/schemas/invitation';
import type { Audit } from '../audit/audit.service';
import { requirePermission, teamOf } from '../http/auth.middleware';
import { unauthorized } from '../http/errors';
import { body } from '../http/validate';
import type { TeamsRepository } from './teams.repository';

/** `/api/teams` (the caller's teams) and `/api/teams/:teamId` (one team, its members). */
export function teamsRoutes(deps: { teams: TeamsRepository; audit: Audit; team: RequestHandler; features: Router }): Router {
  const router = Router();
  const { teams, audit } = deps;

  router.get('/', async (req, res) => {
    if (!req.user) throw unauthorized();
    res.json(await teams.teamsOf(req.user.id));
  });

  router.post('/', async (req, res) => {
    if (!req.user) throw unauthorized();
    const { name } = body(req, createTeamSchema);
    const team = await teams.create(name, req.user.id);
    await audit.record({ teamId: team.id, actorId: req.user.id, action: 'team.created' });
    res.status(201).json(team);
  });

  const one = Router({ mergeParams: true });
  router.use('/:teamId', deps.team, one);

  one.get('/', async (req, res) => {
    const { teamId, userId } = teamOf(req);
    res.json(await teams.membership(teamId, userId));
  });

  one.patch('/', requirePermission('manageTeam'), async (req, res) => {
    const { teamId, userId } = teamOf(req);
    const { name } = body(req, updateTeamSchema);
    await teams.rename(teamId, name);
    await audit.record({ teamId, actorId: userId, action: 'team.renamed', details: { name } });
    res.json(await teams.membership(teamId, userId));
  });

  one.get('/settings', async (req, res) => {
    const { teamId } = teamOf(req);
    res.json(await teams.settings(teamId));
  });

  one.patch('/settings', requirePermission('manageTeam'), async (req, res) => {
    const { teamId, userId } = teamOf(req);
    const patch = body(req, teamSettingsPatchSchema);
    const saved = await teams.saveSettings(teamId, patch);
    await audit.record({ teamId, actorId: userId, action: 'team.settings_changed', details: patch as Record<string, unknown> });
    res.json(saved);
  });

  one.get('/members', async (req, res) => {
    const { teamId } = teamOf(req);
    res.json(await teams.members(teamId));
  });

  one.patch('/members/:userId', requirePermission('manageMembers'), async (req, res) => {
    const { teamId, userId: actorId } = teamOf(req);
    const { role } = body(req, updateMemberSchema);
    const memberId = String(req.params['userId']);
    const { previousRole } = await teams.changeMember(teamId, memberId, { role });
    await audit.record({ teamId, actorId, action: 'member.role_changed', subjectType: 'user', subjectId: memberId, details: { from: previousRole, to: role } });
    const member = (await teams.members(teamId)).find((m) => m.userId === memberId);
    res.json(member);
  });

  one.delete('/members/:userId', requirePermission('manageMembers'), async (req, res) => {
    const { teamId, userId: actorId } = teamOf(req);
    const memberId = String(req.params['userId']);
    const { previousRole } = await teams.changeMember(teamId, memberId, 'remove');
    await audit.record({ teamId, actorId, action: 'member.removed', subjectType: 'user', subjectId: memberId, details: { role: previousRole } });
    res.status(204).end();
  });

  one.use(deps.features);
  return router;
}
