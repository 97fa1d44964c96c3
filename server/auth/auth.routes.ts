import { Router, type RequestHandler } from 'express';
import { ipKeyGenerator, rateLimit } from 'express-rate-limit';
import { signInSchema, signUpSchema } from '../../shared/schemas/auth';
import { passwordResetConfirmSchema, passwordResetRequestSchema } from '../../shared/schemas/invitation';
import type { PasswordResetService } from './password-reset.service';
import { tooManyRequests, unauthorized } from '../http/errors';
import { body } from '../http/validate';
import type { AuthService } from './auth.service';
import { clearSessionCookie, issueToken, setSessionCookie, type TokenSettings } from './session-token';

export function authRoutes(deps: {
  auth: AuthService;
  resets: PasswordResetService;
  tokens: TokenSettings;
  session: RequestHandler;
  signInLimit: number;
  resetLimit: number;
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

  const resetLimiter = rateLimit({
    windowMs: 15 * 60_000,
    limit: deps.resetLimit,
    standardHeaders: 'draft-8',
    legacyHeaders: false,
    keyGenerator: (req) => `${ipKeyGenerator(req.ip ?? '')}|${String(req.body?.email ?? '').toLowerCase()}`,
    handler: () => {
      throw tooManyRequests();
    },
  });

  // No hint whether the address has an account: the same 202 either way.
  router.post('/password-reset', resetLimiter, async (req, res) => {
    const { email } = body(req, passwordResetRequestSchema);
    await deps.resets.request(email);
    res.status(202).json({ ok: true, message: 'If that address has an account, a reset link is on its way.' });
  });

  router.post('/password-reset/confirm', async (req, res) => {
    const { token, password } = body(req, passwordResetConfirmSchema);
    await deps.resets.confirm(token, password);
    res.json({ ok: true });
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
