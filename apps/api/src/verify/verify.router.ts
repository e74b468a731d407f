// GET /api/verify/:token (public, rate-limited per client address) and the QA manager's token routes
// under /api/welders/:id/verify-token.
import { Router, type RequestHandler } from 'express';
import { rateLimit, ipKeyGenerator } from 'express-rate-limit';
import type { AppDeps } from '../lib/context.js';
import { AppError } from '../lib/errors.js';
import { pathParam } from '../lib/params.js';
import { actorOf, requireRole } from '../lib/auth.js';
import * as tokens from './verify-tokens.service.js';
import { verifyView } from './verify.service.js';

export function verifyRouter(deps: AppDeps): Router {
  const router = Router();
  router.use(
    rateLimit({
      windowMs: 60 * 1000,
      limit: deps.config.verifyRateLimit,
      standardHeaders: 'draft-8',
      legacyHeaders: false,
      keyGenerator: (req) => ipKeyGenerator(req.ip ?? ''),
      handler: (_req, _res, next) =>
        next(
          new AppError('rate_limited', 'Too many look-ups from this address; wait a minute and try again'),
        ),
    }),
  );
  router.get('/:token', async (req, res) => {
    res.json(await verifyView(deps, pathParam(req, 'token')));
  });
  return router;
}

/** Mounted at /api/welders. */
export function verifyTokenRouter(deps: AppDeps, requireAuth: RequestHandler): Router {
  const router = Router();
  const qa = [requireAuth, requireRole('qa_manager')];
  router.get('/:id/verify-token', ...qa, async (req, res) => {
    res.json(await tokens.verifyTokenStatus(deps, actorOf(req), pathParam(req, 'id')));
  });
  router.post('/:id/verify-token', ...qa, async (req, res) => {
    res.status(201).json(await tokens.issueVerifyToken(deps, actorOf(req), pathParam(req, 'id')));
  });
  router.delete('/:id/verify-token', ...qa, async (req, res) => {
    await tokens.revokeVerifyToken(deps, actorOf(req), pathParam(req, 'id'));
    res.status(204).end();
  });
  return router;
}
