// /api/welders
import { Router, type RequestHandler } from 'express';
import { welderInput, welderListQuery, welderUpdateInput } from '@beadroll/rules';
import type { AppDeps } from '../lib/context.js';
import { pathParam } from '../lib/params.js';
import { actorOf, requireRole } from '../lib/auth.js';
import { createWelderAccount } from '../people/people.service.js';
import { sendLinkMailsAfter } from '../auth/link-mail.js';
import * as welders from './welders.service.js';

export function weldersRouter(deps: AppDeps, requireAuth: RequestHandler): Router {
  const router = Router();
  router.use(requireAuth);

  router.get('/', async (req, res) => {
    res.json(await welders.listWelders(deps, actorOf(req), welderListQuery.parse(req.query)));
  });

  router.get('/:id', async (req, res) => {
    res.json(await welders.getWelder(deps, actorOf(req), pathParam(req, 'id')));
  });

  router.post('/', requireRole('qa_manager'), async (req, res) => {
    res.status(201).json(await welders.createWelder(deps, actorOf(req), welderInput.parse(req.body)));
  });

  router.patch('/:id', requireRole('qa_manager'), async (req, res) => {
    res.json(
      await welders.updateWelder(deps, actorOf(req), pathParam(req, 'id'), welderUpdateInput.parse(req.body)),
    );
  });

  // A welder sign-in belongs to the people feature; this route composes the two.
  router.post('/:id/account', requireRole('qa_manager'), async (req, res) => {
    const person = await createWelderAccount(deps, actorOf(req), pathParam(req, 'id'));
    sendLinkMailsAfter(res, deps, actorOf(req).organizationId);
    res.status(201).json(person);
  });

  return router;
}
