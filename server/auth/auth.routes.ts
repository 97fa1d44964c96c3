import { Router, type RequestHandler } from 'express';
import { ipKeyGenerator, rateLimit } from 'express-rate-limit';
import { signInSchema, signUpSchema } from '../../shared/schemas/auth';
import { tooManyRequests, unauthorized } from '../http/errors';
import { body } from '../http/validate';
import type { AuthService } from './auth.service';
import { clearSessionCookie, issueToken, setSessionCookie, type TokenSettings } from './session-token';

export function authRoutes(deps: {
  auth: AuthService;
  tokens: TokenSettings;
  session: RequestHandler;
  signInLimit: number;
}): Router {
  const router = Router();
  const { auth, tokens } = deps;

  // Per address and e-mail, so one person guessing cannot lock out a whole studio behind one NAT.
  const signInLimiter = rateLimit({
    windowMs: 15 * 60_000,
    limit: deps.signInLimit,
    standardHeaders: 'draft-8',
    legacyHeaders: false,
    keyGenerator: (req) => `${ipKeyGenerator(req.ip ?? '')}|${String(req.body?.email ?? '').toLowerCase()}`,
    handler: () => {
      throw tooManyRequests();
    },
  });

  router.post('/sign-up', async (req, res) => {
    const input = body(req, signUpSchema);
    const session = await auth.signUp(input);
    setSessionCookie(res, issueToken(session.user.id, tokens), tokens);
    res.status(201).json(session);
  });

  router.post('/sign-in', signInLimiter, async (req, res) => {
    const input = body(req, signInSchema);
    const session = await auth.signIn(input);
    setSessionCookie(res, issueToken(session.user.id, tokens), tokens);
    res.json(session);
  });

  router.post('/sign-out', (_req, res) => {
    clearSessionCookie(res, tokens);
    res.status(204).end();
  });

  router.get('/me', deps.session, async (req, res) => {
    if (!req.user) throw unauthorized();
    res.json(await auth.sessionOf(req.user));
  });

  return router;
}
