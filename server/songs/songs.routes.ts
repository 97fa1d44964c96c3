import { Router } from 'express';
import { songInputSchema, songListQuerySchema, songPatchSchema } from '../../shared/schemas/song';
import { requirePermission, teamOf } from '../http/auth.middleware';
import { body, query } from '../http/validate';
import type { SongsRepository } from './songs.repository';

/** `/api/teams/:teamId/songs`. */
export function songsRoutes(deps: { songs: SongsRepository }): Router {
  const router = Router({ mergeParams: true });
  const { songs } = deps;

  router.get('/', async (req, res) => {
    const { teamId } = teamOf(req);
    res.json(await songs.list(teamId, query(req, songListQuerySchema)));
  });

  router.post('/', requirePermission('editSongs'), async (req, res) => {
    const { teamId, userId } = teamOf(req);
    res.status(201).json(await songs.create(teamId, userId, body(req, songInputSchema)));
  });

  router.get('/:songId', async (req, res) => {
    const { teamId } = teamOf(req);
    res.json(await songs.get(teamId, String(req.params['songId'])));
  });

  router.patch('/:songId', requirePermission('editSongs'), async (req, res) => {
    const { teamId } = teamOf(req);
    res.json(await songs.update(teamId, String(req.params['songId']), body(req, songPatchSchema)));
  });

  router.delete('/:songId', requirePermission('deleteSongs'), async (req, res) => {
    const { teamId } = teamOf(req);
    await songs.remove(teamId, String(req.params['songId']));
    res.status(204).end();
  });

  return router;
}
