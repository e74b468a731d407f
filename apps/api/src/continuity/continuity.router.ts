// /api/continuity (the monthly log and its review queue) and /api/welders/:id/timeline
import express, { Router, type RequestHandler } from 'express';
import type { AppDeps } from '../lib/context.js';
import { pathParam } from '../lib/params.js';
import { actorOf, requireRole } from '../lib/auth.js';
import * as continuity from './continuity.service.js';
import { gridQuery, gridSaveInput, gridWeldersQuery, reviewInput } from './continuity.schema.js';

/**
 * The body limit of a month save. The schema allows 2,000 saved and 2,000 removed cells; a saved cell is at
 * most about 2.6 KB of JSON (a 500-character note and an 80-character job of 4-byte characters, the id,
 * process, date and version) and a removed one about 0.1 KB: about 5.4 MB. The app-wide 100 KB limit stays
 * for every other route; app.ts mounts this parser for PUT /api/continuity/grid ahead of it.
 */
export const GRID_SAVE_BODY_LIMIT = '6mb';
export const gridSaveBodyParser = express.json({ limit: GRID_SAVE_BODY_LIMIT });

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
