// /api/continuity (the monthly log and its review queue) and /api/welders/:id/timeline
import { Router, type RequestHandler } from 'express';
import type { AppDeps } from '../lib/context.js';
import { pathParam } from '../lib/params.js';
import { actorOf, requireRole } from '../lib/auth.js';
import * as continuity from './continuity.service.js';
import { gridQuery, gridSaveInput, gridWeldersQuery, reviewInput } from './continuity.schema.js';

export function continuityRouter(deps: AppDeps, requireAuth: RequestHandler): Router {
  const router = Router();
  router.use(requireAuth, requireRole('qa_manager', 'foreman'));

  router.get('/grid', async (req, res) => {
    res.json(await continuity.getGrid(deps, actorOf(req), gridQuery.parse(req.query)));
  });

  router.put('/grid', async (req, res) => {
    res.json(await continuity.saveGrid(deps, actorOf(req), gridSaveInput.parse(req.body)));
  });

  router.get('/welders', async (req, res) => {
    res.json(await continuity.addableWelders(deps, actorOf(req), gridWeldersQuery.parse(req.query)));
  });

  router.get('/review', requireRole('qa_manager'), async (req, res) => {
    res.json(await continuity.reviewQueue(deps, actorOf(req)));
  });

  router.post('/entries/:id/review', requireRole('qa_manager'), async (req, res) => {
    res.json(
      await continuity.reviewEntry(deps, actorOf(req), pathParam(req, 'id'), reviewInput.parse(req.body ?? {})),
    );
  });

  return router;
}

export function welderTimelineRouter(deps: AppDeps, requireAuth: RequestHandler): Router {
  const router = Router();
  router.get('/:id/timeline', requireAuth, async (req, res) => {
    res.json(await continuity.welderTimeline(deps, actorOf(req), pathParam(req, 'id')));
  });
  return router;
}
