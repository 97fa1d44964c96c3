import { Router, type RequestHandler } from 'express';
import multer from 'multer';
import { stemUploadFieldsSchema } from '../../shared/schemas/stem';
import type { Audit } from '../audit/audit.service';
import { requirePermission, teamOf } from '../http/auth.middleware';
import { parse } from '../http/validate';
import type { HashedFile } from '../storage/hashing-storage';
import { hashingStorage } from '../storage/hashing-storage';
import type { FileStore } from '../storage/file-store';
import type { StemsService } from './stems.service';

/** `/api/teams/:teamId/songs/:songId/stems` (the song is checked by `song` first). */
export function stemsRoutes(deps: { stems: StemsService; store: FileStore; maxUploadBytes: number; song: RequestHandler; audit: Audit }): Router {
  const router = Router({ mergeParams: true });
  const { stems, store } = deps;
  const upload = multer({ storage: hashingStorage(store), limits: { fileSize: deps.maxUploadBytes, files: 1, fields: 10, fieldSize: 1024 } });
  const songId = (req: Parameters<RequestHandler>[0]) => String(req.params['songId']);

  router.get('/', deps.song, async (req, res) => {
    res.json(await stems.list(songId(req)));
  });

  router.post('/', requirePermission('prepareSongs'), deps.song, upload.single('file'), async (req, res) => {
    const file = req.file as HashedFile | undefined;
    try {
      const { userId, teamId } = teamOf(req);
      const fields = parse(stemUploadFieldsSchema, req.body, 'form fields');
      const result = await stems.upload(songId(req), userId, stems.requireFile(file), fields);
      await deps.audit.record({ teamId, actorId: userId, action: 'stem.uploaded', subjectType: 'stem', subjectId: result.stem.id, details: { songId: songId(req), slot: result.stem.slot, revision: result.stem.revision } });
      res.status(201).json(result);
    } finally {
      // A refused upload leaves nothing behind: the temporary part goes, no row was written.
      if (file?.path) await store.removeTemp(file.path);
    }
  });

  router.get('/:stemId/overview', deps.song, async (req, res) => {
    res.setHeader('Cache-Control', 'private, max-age=31536000, immutable');
    res.json(await stems.overview(songId(req), String(req.params['stemId'])));
  });

  router.get('/:stemId/activity', deps.song, async (req, res) => {
    const activity = await stems.activity(songId(req), String(req.params['stemId']));
    res.setHeader('Cache-Control', 'private, max-age=31536000, immutable');
    // −Infinity (digital silence) is not JSON: sent as −200 dBFS.
    res.json({ hopSec: activity.hopSec, peakDbfs: Array.from(activity.peakDbfs, (v) => (Number.isFinite(v) ? Math.round(v * 10) / 10 : -200)) });
  });

  router.get('/:stemId/file', deps.song, async (req, res) => {
    const { row, path } = await stems.file(songId(req), String(req.params['stemId']));
    res.download(path, row.originalName);
  });

  router.post('/:stemId/restore', requirePermission('prepareSongs'), deps.song, async (req, res) => {
    res.json(await stems.restore(songId(req), String(req.params['stemId'])));
  });

  return router;
}
