// /api/paper-records — imported paper WPQs whose stated ranges differ from the computed ones (QA manager).
import { Router, type RequestHandler } from 'express';
import { paperRecordListQuery, paperSettleInput } from '@beadroll/rules';
import type { AppDeps } from '../lib/context.js';
import { actorOf, requireRole } from '../lib/auth.js';
import { pathParam } from '../lib/params.js';
import { refuseApiTokens } from '../api-tokens/bearer.js';
import * as service from './paper-records.service.js';

export function paperRecordsRouter(deps: AppDeps, requireAuth: RequestHandler): Router {
  const router = Router();
  router.use(requireAuth, refuseApiTokens, requireRole('qa_manager'));

  router.get('/', async (req, res) => {
    res.json(await service.listPaperRecords(deps, actorOf(req), paperRecordListQuery.parse(req.query)));
  });

  router.post('/:id/settle', async (req, res) => {
    res.json(await service.settlePaperRecord(deps, actorOf(req), pathParam(req, 'id'), paperSettleInput.parse(req.body)));
  });

  return router;
}
