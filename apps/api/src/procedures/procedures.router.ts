// /api/procedures: the WPS register (QA manager writes; QA manager and foreman read).
import { Router, type RequestHandler } from 'express';
import { procedureInput, procedureListQuery, procedureUpdateInput } from '@beadroll/rules';
import type { AppDeps } from '../lib/context.js';
import { pathParam } from '../lib/params.js';
import { actorOf, requireRole } from '../lib/auth.js';
import * as procedures from './procedures.service.js';

export function proceduresRouter(deps: AppDeps, requireAuth: RequestHandler): Router {
  const router = Router();
  router.use(requireAuth, requireRole('qa_manager', 'foreman'));

  router.get('/', async (req, res) => {
    res.json(await procedures.listProcedures(deps, actorOf(req), procedureListQuery.parse(req.query)));
  });

  router.get('/:id', async (req, res) => {
    res.json(await procedures.getProcedure(deps, actorOf(req), pathParam(req, 'id')));
  });

  router.post('/', requireRole('qa_manager'), async (req, res) => {
    res
      .status(201)
      .json(await procedures.createProcedure(deps, actorOf(req), procedureInput.parse(req.body)));
  });

  router.patch('/:id', requireRole('qa_manager'), async (req, res) => {
    res.json(
      await procedures.updateProcedure(
        deps,
        actorOf(req),
        pathParam(req, 'id'),
        procedureUpdateInput.parse(req.body),
      ),
    );
  });

  return router;
}
