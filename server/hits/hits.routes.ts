import { Router, type RequestHandler } from 'express';
import { detectRequestSchema, hitEditSchema } from '../../shared/schemas/hit-map';
import { requirePermission } from '../http/auth.middleware';
import { body } from '../http/validate';
import type { HitsService } from './hits.service';

/** `/api/teams/:teamId/songs/:songId/hits`. */
export function hitsRoutes(deps: { hits: HitsService; song: RequestHandler }): Router {
  const router = Router({ mergeParams: true });
  const { hits } = deps;
  const songId = (req: Parameters<RequestHandler>[0]) => String(req.params['songId']);

  router.get('/', deps.song, async (req, res) => {
    res.json(await hits.get(songId(req)));
  });

  router.get('/average-kick', deps.song, async (req, res) => {
    res.json(await hits.averageKick(songId(req)));
  });

  router.post('/detect', requirePermission('prepareSongs'), deps.song, async (req, res) => {
    res.json(await hits.detect(songId(req), body(req, detectRequestSchema)));
  });

  router.patch('/', requirePermission('prepareSongs'), deps.song, async (req, res) => {
    res.json(await hits.edit(songId(req), body(req, hitEditSchema)));
  });

  router.post('/acknowledge', requirePermission('prepareSongs'), deps.song, async (req, res) => {
    await hits.acknowledge(songId(req));
    res.json(await hits.get(songId(req)));
  });

  return router;
}
