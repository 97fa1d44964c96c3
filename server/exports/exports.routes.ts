import { Router, type RequestHandler } from 'express';
import { exportRequestSchema } from '../../shared/schemas/export-request';
import type { Audit } from '../audit/audit.service';
import { requirePermission, teamOf } from '../http/auth.middleware';
import { body } from '../http/validate';
import type { ExportsService } from './exports.service';

const contentTypes = { csv: 'text/csv; charset=utf-8', midi: 'audio/midi', wav: 'audio/wav' } as const;

/** `/api/teams/:teamId/songs/:songId/exports`. */
export function exportsRoutes(deps: { exports: ExportsService; song: RequestHandler; audit: Audit }): Router {
  const router = Router({ mergeParams: true });
  const { exports } = deps;
  const songId = (req: Parameters<RequestHandler>[0]) => String(req.params['songId']);

  router.get('/', deps.song, async (req, res) => {
    res.json(await exports.list(teamOf(req).teamId, songId(req)));
  });

  router.post('/', requirePermission('export'), deps.song, async (req, res) => {
    const { teamId, userId } = teamOf(req);
    const created = await exports.create(teamId, songId(req), userId, body(req, exportRequestSchema));
    await deps.audit.record({ teamId, actorId: userId, action: 'export.created', subjectType: 'export', subjectId: created.id, details: { songId: songId(req), format: created.format, fileName: created.fileName } });
    res.status(201).json(created);
  });

  router.get('/:exportId/file', deps.song, async (req, res) => {
    const { row, path } = await exports.file(songId(req), String(req.params['exportId']));
    res.setHeader('Content-Type', contentTypes[row.format]);
    res.download(path, row.fileName, { headers: { 'Content-Type': contentTypes[row.format] } });
  });

  return router;
}
