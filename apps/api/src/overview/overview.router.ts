// /api/overview (QA manager and foreman)
import { Router, type RequestHandler } from 'express';
import type { AppDeps } from '../lib/context.js';
import { actorOf, requireRole } from '../lib/auth.js';
import { getOverview } from './overview.service.js';

export function overviewRouter(deps: AppDeps, requireAuth: RequestHandler): Router {
  const router = Router();
  router.use(requireAuth, requireRole('qa_manager', 'foreman'));
  router.get('/', async (req, res) => {
    res.json(await getOverview(deps, actorOf(req)));
  });
  return router;
}
