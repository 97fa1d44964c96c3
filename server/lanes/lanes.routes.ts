import { Router, type RequestHandler } from 'express';
import { laneCreateSchema, lanePatchSchema } from '../../shared/schemas/lane';
import { requirePermission, teamOf } from '../http/auth.middleware';
import { applyPresetSchema } from '../../shared/schemas/preset';
import { can } from '../../shared/schemas/team';
import { body } from '../http/validate';
import type { LanesService } from './lanes.service';

/** `/api/teams/:teamId/songs/:songId/lanes`. */
export function lanesRoutes(deps: { lanes: LanesService; song: RequestHandler }): Router {
  const router = Router({ mergeParams: true });
  const { lanes } = deps;
  const songId = (req: Parameters<RequestHandler>[0]) => String(req.params['songId']);
  const laneId = (req: Parameters<RequestHandler>[0]) => String(req.params['laneId']);

  router.get('/', deps.song, async (req, res) => {
    res.json(await lanes.list(songId(req), teamOf(req).teamId));
  });
  router.post('/', requirePermission('editLanes'), deps.song, async (req, res) => {
    res.status(201).json(await lanes.create(songId(req), body(req, laneCreateSchema)));
  });
  router.get('/:laneId', deps.song, async (req, res) => {
    res.json(await lanes.get(songId(req), laneId(req), teamOf(req).teamId));
  });
  router.post('/:laneId/apply-preset', requirePermission('editLanes'), deps.song, async (req, res) => {
    const { teamId, role } = teamOf(req);
    const { presetId } = body(req, applyPresetSchema);
    res.json(await lanes.applyPreset(teamId, songId(req), laneId(req), presetId, can(role, 'editPresets')));
  });
  router.patch('/:laneId', requirePermission('editLanes'), deps.song, async (req, res) => {
    res.json(await lanes.update(songId(req), laneId(req), body(req, lanePatchSchema)));
  });
  router.delete('/:laneId', requirePermission('editLanes'), deps.song, async (req, res) => {
    await lanes.remove(songId(req), laneId(req));
    res.status(204).end();
  });
  router.get('/:laneId/curve', deps.song, async (req, res) => {
    res.json(await lanes.curve(songId(req), laneId(req)));
  });
  return router;
}
