import { Router, type RequestHandler } from 'express';
import { teamOf } from '../http/auth.middleware';
import type { SongsRepository } from '../songs/songs.repository';
import { reportHtml } from './report-html';
import type { ReportService } from './report.service';

/** JSON has no −Infinity (silence): sent as null. */
const finite = (_key: string, value: unknown) => (typeof value === 'number' && !Number.isFinite(value) ? null : value);

/** `/api/teams/:teamId/songs/:songId/report`. */
export function reportRoutes(deps: { reports: ReportService; songs: SongsRepository; song: RequestHandler }): Router {
  const router = Router({ mergeParams: true });
  router.get('/printable', deps.song, async (req, res) => {
    const songId = String(req.params['songId']);
    const song = await deps.songs.get(teamOf(req).teamId, songId);
    res.type('html').send(reportHtml(song, await deps.reports.report(songId)));
  });
  router.get('/', deps.song, async (req, res) => {
    const report = await deps.reports.report(String(req.params['songId']));
    res.type('json').send(JSON.stringify(report, finite));
  });
  return router;
}
