import { Router, type RequestHandler } from 'express';
import { laneCreateSchema, lanePatchSchema } from '../../shared/schemas/lane';
import { requirePermission } from '../http/auth.middleware';
import { body } from '../http/validate';
import type { LanesService } from './lanes.service';

/** `/api/teams/:teamId/songs/:songId/lanes`. */
export function lanesRoutes(deps: { lanes: LanesService; song: RequestHandler }): Router {
  const router = Router({ mergeParams: true });
  const { lanes } = deps;
  const songId = (req: Parameters<RequestHandler>[0]) => String(req.params['songId']);
  const laneId = (req: Parameters<RequestHandler>[0]) => String(req.params['laneId']);

  router.get('/', deps.song, async (req, res) => {
    res.json(await lanes.list(songId(req)));
  });
  router.post('/', requirePermission('editLanes'), deps.song, async (req, res) => {
    res.status(201).json(await lanes.create(songId(req), body(req, laneCreateSchema)));
  });
  router.get('/:laneId', deps.song, async (req, res) => {
    res.json(await lanes.get(songId(req), laneId(req)));
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
