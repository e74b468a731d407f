// /api/api-tokens — managed by a signed-in QA manager only (never by a token).
import { Router, type RequestHandler } from 'express';
import { apiTokenInput } from '@beadroll/rules';
import type { AppDeps } from '../lib/context.js';
import { actorOf, requireRole } from '../lib/auth.js';
import { pathParam } from '../lib/params.js';
import { refuseApiTokens } from './bearer.js';
import * as tokens from './api-tokens.service.js';

export function apiTokensRouter(deps: AppDeps, requireAuth: RequestHandler): Router {
  const router = Router();
  router.use(requireAuth, refuseApiTokens, requireRole('qa_manager'));

  router.get('/', async (req, res) => {
    res.json(await tokens.listTokens(deps, actorOf(req)));
  });

  router.post('/', async (req, res) => {
    res.status(201).json(await tokens.createToken(deps, actorOf(req), apiTokenInput.parse(req.body)));
  });

  router.post('/:id/revoke', async (req, res) => {
    res.json(await tokens.revokeToken(deps, actorOf(req), pathParam(req, 'id')));
  });

  return router;
}
