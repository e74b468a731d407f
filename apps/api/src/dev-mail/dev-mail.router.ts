// /api/dev/mail — a development tool: no sign-in, and app.ts mounts it only outside production.
import { Router } from 'express';
import type { AppDeps } from '../lib/context.js';
import { pathParam } from '../lib/params.js';
import * as devMail from './dev-mail.service.js';

export function devMailRouter(deps: AppDeps): Router {
  const router = Router();
  router.get('/', async (_req, res) => {
    res.json(await devMail.listMail(deps.config.mailDir));
  });
  router.get('/:id', async (req, res) => {
    res.json(await devMail.getMail(deps.config.mailDir, pathParam(req, 'id')));
  });
  return router;
}
