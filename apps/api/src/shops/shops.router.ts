// /api/shops
import { Router, type RequestHandler } from 'express';
import { shopInput, shopUpdateInput } from '@beadroll/rules';
import type { AppDeps } from '../lib/context.js';
import { pathParam } from '../lib/params.js';
import { actorOf, requireRole } from '../lib/auth.js';
import * as shops from './shops.service.js';

export function shopsRouter(deps: AppDeps, requireAuth: RequestHandler): Router {
  const router = Router();
  router.use(requireAuth);

  router.get('/', async (req, res) => {
    res.json(await shops.listShops(deps, actorOf(req)));
  });

  router.get('/:id', async (req, res) => {
    res.json(await shops.getShop(deps, actorOf(req), pathParam(req, 'id')));
  });

  router.post('/', requireRole('qa_manager'), async (req, res) => {
    res.status(201).json(await shops.createShop(deps, actorOf(req), shopInput.parse(req.body)));
  });

  router.patch('/:id', requireRole('qa_manager'), async (req, res) => {
    res.json(
      await shops.updateShop(deps, actorOf(req), pathParam(req, 'id'), shopUpdateInput.parse(req.body)),
    );
  });

  return router;
}
