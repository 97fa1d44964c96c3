import { Router, type RequestHandler } from 'express';
import type { ReportService } from './report.service';

/** JSON has no −Infinity (silence): sent as null. */
const finite = (_key: string, value: unknown) => (typeof value === 'number' && !Number.isFinite(value) ? null : value);

/** `/api/teams/:teamId/songs/:songId/report`. */
export function reportRoutes(deps: { reports: ReportService; song: RequestHandler }): Router {
  const router = Router({ mergeParams: true });
  router.get('/', deps.song, async (req, res) => {
    const report = await deps.reports.report(String(req.params['songId']));
    res.type('json').send(JSON.stringify(report, finite));
  });
  return router;
}
