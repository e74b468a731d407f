// /api/audit — QA managers only.
import { Router, type RequestHandler } from 'express';
import type { AppDeps } from '../lib/context.js';
import { actorOf, requireRole } from '../lib/auth.js';
import { auditListQuery } from '@beadroll/rules';
import * as audit from './audit.service.js';

export function auditRouter(deps: AppDeps, requireAuth: RequestHandler): Router {
  const router = Router();
  router.use(requireAuth, requireRole('qa_manager'));
  router.get('/', async (req, res) => {
    res.json(await audit.listAudit(deps, actorOf(req), auditListQuery.parse(req.query)));
  });
  return router;
}
