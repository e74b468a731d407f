// /api/people — QA managers only.
import { Router, type RequestHandler } from 'express';
import { personInput, personUpdateInput } from '@beadroll/rules';
import type { AppDeps } from '../lib/context.js';
import { pathParam } from '../lib/params.js';
import { actorOf, requireRole } from '../lib/auth.js';
import { sendLinkMailsAfter } from '../auth/link-mail.js';
import * as people from './people.service.js';

export function peopleRouter(deps: AppDeps, requireAuth: RequestHandler): Router {
  const router = Router();
  router.use(requireAuth, requireRole('qa_manager'));

  router.get('/', async (req, res) => {
    res.json(await people.listPeople(deps, actorOf(req)));
  });

  router.get('/:id', async (req, res) => {
    res.json(await people.getPerson(deps, actorOf(req), pathParam(req, 'id')));
  });

  router.post('/', async (req, res) => {
    const person = await people.invitePerson(deps, actorOf(req), personInput.parse(req.body));
    sendLinkMailsAfter(res, deps, actorOf(req).organizationId);
    res.status(201).json(person);
  });

  router.patch('/:id', async (req, res) => {
    res.json(
      await people.updatePerson(deps, actorOf(req), pathParam(req, 'id'), personUpdateInput.parse(req.body)),
    );
  });

  router.post('/:id/invitation', async (req, res) => {
    await people.resendInvitation(deps, actorOf(req), pathParam(req, 'id'));
    sendLinkMailsAfter(res, deps, actorOf(req).organizationId);
    res.status(202).json({ status: 'sent' });
  });

  return router;
}
