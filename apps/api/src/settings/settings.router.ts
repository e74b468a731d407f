// /api/settings (QA manager)
import { Router, type RequestHandler } from 'express';
import { companySettingsInput } from '@beadroll/rules';
import type { AppDeps } from '../lib/context.js';
import { actorOf, requireRole } from '../lib/auth.js';
import * as settings from './settings.service.js';

export function settingsRouter(deps: AppDeps, requireAuth: RequestHandler): Router {
  const router = Router();
  router.use(requireAuth, requireRole('qa_manager'));

  router.get('/', async (req, res) => {
    res.json(await settings.getSettings(deps, actorOf(req)));
  });

  router.patch('/', async (req, res) => {
    res.json(await settings.updateSettings(deps, actorOf(req), companySettingsInput.parse(req.body)));
  });

  return router;
}
