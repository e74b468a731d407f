// GET /api/crew-finder — who may weld a joint from today through a day; for the QA manager and foremen
// (a foreman's search covers the welders of their shops).
import { Router, type RequestHandler } from 'express';
import { crewFinderQuery } from '@beadroll/rules';
import type { AppDeps } from '../lib/context.js';
import { actorOf, requireRole } from '../lib/auth.js';
import { findCrew } from './crew-finder.service.js';

export function crewFinderRouter(deps: AppDeps, requireAuth: RequestHandler): Router {
  const router = Router();
  router.get('/', requireAuth, requireRole('qa_manager', 'foreman'), async (req, res) => {
    res.json(await findCrew(deps, actorOf(req), crewFinderQuery.parse(req.query)));
  });
  return router;
}
