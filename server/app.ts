import { existsSync } from 'node:fs';
import { join } from 'node:path';
import cookieParser from 'cookie-parser';
import express, { Router, type RequestHandler } from 'express';
import helmet from 'helmet';
import { pino } from 'pino';
import { pinoHttp } from 'pino-http';
import { createAudit } from './audit/audit.service';
import { authRoutes } from './auth/auth.routes';
import { createAuthService } from './auth/auth.service';
import type { AppConfig } from './config/env';
import type { Database } from './db/client';
import { requireSession, requireTeam } from './http/auth.middleware';
import { errorMiddleware, notFoundMiddleware } from './http/error-middleware';
import { createSongsRepository } from './songs/songs.repository';
import { songsRoutes } from './songs/songs.routes';
import { createTeamsRepository } from './teams/teams.repository';
import { teamsRoutes } from './teams/teams.routes';
import { createUsersRepository } from './users/users.repository';
import { createExportsService } from './exports/exports.service';
import { exportsRoutes } from './exports/exports.routes';
import { createHitsRepository } from './hits/hits.repository';
import { createHitsService } from './hits/hits.service';
import { hitsRoutes } from './hits/hits.routes';
import { createLanesRepository } from './lanes/lanes.repository';
import { createLanesService } from './lanes/lanes.service';
import { lanesRoutes } from './lanes/lanes.routes';
import { createStemsRepository } from './stems/stems.repository';
import { createStemsService } from './stems/stems.service';
import { stemsRoutes } from './stems/stems.routes';
import { createFileStore } from './storage/file-store';
import { createPresetsRepository } from './presets/presets.repository';
import { presetsRoutes } from './presets/presets.routes';
import { auditRoutes } from './audit/audit.routes';
import { createReportService } from './report/report.service';
import { reportRoutes } from './report/report.routes';
import { createPasswordResetService } from './auth/password-reset.service';
import { createInvitationsService } from './invitations/invitations.service';
import { publicInvitationsRoutes, teamInvitationsRoutes } from './invitations/invitations.routes';
import { devInboxRoutes } from './mail/dev-inbox.routes';
import type { FakeSmtp } from './mail/fake-smtp';
import { createMailer, type Mailer } from './mail/mailer';
import { teamOf } from './http/auth.middleware';

export interface AppDeps {
  db: Database;
  config: AppConfig;
  /** Outgoing mail; `main.ts` passes nodemailer over SMTP_URL or over the local fake. */
  mailer?: Mailer;
  /** The local SMTP fake, when running: its messages are readable at /dev/mail. */
  fakeSmtp?: FakeSmtp;
  /** Password reset requests per address and e-mail per 15 minutes. */
  resetLimit?: number;
  /** Sign-in attempts per address and e-mail per 15 minutes. */
  signInLimit?: number;
}

/** Builds the Express app; `server/main.ts` listens, tests drive it with supertest. */
export function createApp(deps: AppDeps) {
  const { db, config } = deps;
  const logger = pino({ level: config.logLevel });
  const users = createUsersRepository(db);
  const teams = createTeamsRepository(db);
  const audit = createAudit(db);
  const songs = createSongsRepository(db);
  const auth = createAuthService({ db, users, teams, audit });
  const mailer = deps.mailer ?? createMailer(config.smtpUrl ?? 'smtp://127.0.0.1:2525', config.mailFrom);
  const resets = createPasswordResetService({ db, users, mailer, publicUrl: config.publicUrl, audit });
  const invitations = createInvitationsService({ db, mailer, publicUrl: config.publicUrl, teams, users, audit });
  const store = createFileStore(config.storageDir);
  const stemsRepo = createStemsRepository(db);
  const hitsService = createHitsService({ db, hits: createHitsRepository(db), stems: stemsRepo, store });
  const stemsService = createStemsService({ db, stems: stemsRepo, store, hits: hitsService });
  const presets = createPresetsRepository(db);
  const lanesRepo = createLanesRepository(db);
  const lanesService = createLanesService({ lanes: lanesRepo, hits: hitsService, stems: stemsService, stemsRepo, presets });
  const reports = createReportService({ hits: hitsService, lanes: lanesService, lanesRepo, store });
  const exportsService = createExportsService({ db, store, songs, lanes: lanesService });
  const tokens = { secret: config.jwtSecret, hours: config.sessionHours, secureCookie: config.publicUrl.startsWith('https:') };

  const app = express();
  app.disable('x-powered-by');
  app.set('trust proxy', 'loopback');
  app.use(
    helmet({
      contentSecurityPolicy: {
        directives: {
          'default-src': ["'self'"],
          'img-src': ["'self'", 'data:', 'blob:'],
          'media-src': ["'self'", 'blob:'],
          'style-src': ["'self'", "'unsafe-inline'"],
          'script-src': ["'self'"],
          'connect-src': ["'self'"],
          'font-src': ["'self'", 'data:'],
        },
      },
    }),
  );
  app.use(
    pinoHttp({
      logger,
      autoLogging: { ignore: (req) => !req.url?.startsWith('/api') },
      serializers: {
        req: (req: { id: unknown; method: string; url: string }) => ({ id: req.id, method: req.method, url: req.url }),
        res: (res: { statusCode: number }) => ({ status: res.statusCode }),
      },
    }),
  );
  app.use(cookieParser());

  const session = requireSession({ users, secret: config.jwtSecret });
  const team = requireTeam({ teams });

  const api = Router();
  api.use(express.json({ limit: '1mb' }));
  api.get('/health', async (_req, res) => {
    await db.execute('select 1');
    res.json({ ok: true });
  });
  api.use('/auth', authRoutes({ auth, resets, tokens, session, signInLimit: deps.signInLimit ?? 20, resetLimit: deps.resetLimit ?? 5 }));
  api.use('/invitations', publicInvitationsRoutes({ invitations, auth, users, tokens }));

  const teamScoped = Router({ mergeParams: true });
  // Every route under a song checks first that the song belongs to the caller's team (404 otherwise).
  const song: RequestHandler = async (req, _res, next) => {
    await songs.get(teamOf(req).teamId, String(req.params['songId']));
    next();
  };
  teamScoped.use('/songs/:songId/stems', stemsRoutes({ stems: stemsService, store, maxUploadBytes: config.maxUploadBytes, song, audit }));
  teamScoped.use('/songs/:songId/hits', hitsRoutes({ hits: hitsService, song }));
  teamScoped.use('/songs/:songId/lanes', lanesRoutes({ lanes: lanesService, song }));
  teamScoped.use('/songs/:songId/exports', exportsRoutes({ exports: exportsService, song, audit }));
  teamScoped.use('/songs/:songId/report', reportRoutes({ reports, songs, song }));
  teamScoped.use('/songs', songsRoutes({ songs }));
  teamScoped.use('/invitations', teamInvitationsRoutes({ invitations }));
  teamScoped.use('/audit', auditRoutes({ db }));
  teamScoped.use('/presets', presetsRoutes({ presets, lanes: lanesService, songs, audit }));

  api.use('/teams', session, teamsRoutes({ teams, audit, team, features: teamScoped }));
  api.use(notFoundMiddleware);
  api.use(errorMiddleware);
  app.use('/api', api);
  if (deps.fakeSmtp && !config.production) app.use('/dev/mail', devInboxRoutes(deps.fakeSmtp));

  // The built Angular app; every other path falls back to index.html for the client router.
  if (existsSync(join(config.webRoot, 'index.html'))) {
    app.use(express.static(config.webRoot, { index: false, maxAge: '1h' }));
    app.get('/{*splat}', (_req, res) => {
      res.setHeader('Cache-Control', 'no-cache');
      res.sendFile(join(config.webRoot, 'index.html'));
    });
  }
  app.use(errorMiddleware);
  return app;
}
