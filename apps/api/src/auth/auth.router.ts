// /api/auth/* and /api/me.
import { Router, type Request, type RequestHandler } from 'express';
import { rateLimit, ipKeyGenerator } from 'express-rate-limit';
import { loginInput, passwordResetRequestInput, setPasswordInput } from '@beadroll/rules';
import type { AppDeps } from '../lib/context.js';
import { pathParam } from '../lib/params.js';
import { AppError } from '../lib/errors.js';
import { actorOf, clearSessionCookie, sessionIdOf, setSessionCookie } from '../lib/auth.js';
import { refuseApiTokens } from '../api-tokens/bearer.js';
import * as auth from './auth.service.js';

/** Counts attempts per client address and e-mail; a successful sign-in does not count. */
function attemptLimiter(limit: number, message: string, countSuccesses: boolean): RequestHandler {
  return rateLimit({
    windowMs: 15 * 60 * 1000,
    limit,
    standardHeaders: 'draft-8',
    legacyHeaders: false,
    skipSuccessfulRequests: !countSuccesses,
    keyGenerator: (req) => {
      const body = req.body as { email?: unknown } | undefined;
      const email = typeof body?.email === 'string' ? body.email.trim().toLowerCase() : '';
      return `${ipKeyGenerator(req.ip ?? '')}|${email}`;
    },
    handler: (_req, _res, next) => next(new AppError('rate_limited', message)),
  });
}

function clientOf(req: Request): auth.ClientInfo {
  return { userAgent: req.get('user-agent') ?? '', address: req.ip ?? '' };
}

export function authRouter(deps: AppDeps, requireAuth: RequestHandler): Router {
  const router = Router();
  const resetLimiter = attemptLimiter(
    deps.config.loginRateLimit,
    'Too many reset requests; wait 15 minutes and try again',
    true,
  );

  router.post('/auth/login', async (req, res) => {
    const { token, me } = await auth.login(deps, loginInput.parse(req.body), clientOf(req));
    setSessionCookie(res, deps.config, token);
    res.json(me);
  });

  router.post('/auth/logout', async (req, res) => {
    await auth.signOut(deps, sessionIdOf(deps.config, req));
    clearSessionCookie(res, deps.config);
    res.status(204).end();
  });

  router.get('/auth/sessions', requireAuth, refuseApiTokens, async (req, res) => {
    res.json(await auth.listSessions(deps, actorOf(req)));
  });

  /** Signs out every other browser or device of the caller. */
  router.post('/auth/sessions/end-others', requireAuth, refuseApiTokens, async (req, res) => {
    res.json(await auth.endOwnSessions(deps, actorOf(req), null));
  });

  router.delete('/auth/sessions/:id', requireAuth, refuseApiTokens, async (req, res) => {
    const actor = actorOf(req);
    const id = pathParam(req, 'id');
    await auth.endOwnSessions(deps, actor, id);
    if (id === actor.sessionId) clearSessionCookie(res, deps.config);
    res.status(204).end();
  });

  router.get('/me', requireAuth, async (req, res) => {
    res.json(await auth.getMe(deps, actorOf(req)));
  });

  // Who is signed in, or nobody (200 either way): what the web app asks on opening, so a visitor
  // without a session gets no 401 logged in the browser (issue 10, item 15). The same session check.
  router.get('/auth/session', (req, res, next) => {
    requireAuth(req, res, (err?: unknown) => {
      if (err instanceof AppError && err.code === 'unauthenticated') return void res.json({ me: null });
      if (err) return next(err);
      auth.getMe(deps, actorOf(req)).then((me) => res.json({ me }), next);
    });
  });

  // The answer goes out before anything is looked up or mailed, so a real account and an unknown
  // address take the same time (issue 11, finding 7); requestPasswordReset logs its own failures.
  router.post('/auth/password-reset', resetLimiter, (req, res) => {
    const { email } = passwordResetRequestInput.parse(req.body);
    res.status(202).json({ status: 'accepted' });
    res.once('finish', () => {
      auth.requestPasswordReset(deps, email).catch((err: unknown) => deps.logger.error({ err }, 'password reset failed'));
    });
  });

  router.get('/auth/tokens/:token', async (req, res) => {
    res.json(await auth.getTokenInfo(deps, pathParam(req, 'token')));
  });

  router.post('/auth/set-password', async (req, res) => {
    const { token, me } = await auth.setPassword(deps, setPasswordInput.parse(req.body), clientOf(req));
    setSessionCookie(res, deps.config, token);
    res.json(me);
  });

  return router;
}
