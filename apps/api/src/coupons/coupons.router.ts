// /api/coupons: qualification tests (QA manager writes; reads scoped like welders) and certification.
import { Router, type RequestHandler } from 'express';
import { certifyInput, couponListQuery, couponRecordInput, couponUpdateInput } from '@beadroll/rules';
import type { AppDeps } from '../lib/context.js';
import { pathParam } from '../lib/params.js';
import { actorOf, requireRole } from '../lib/auth.js';
import { certifyCoupon } from '../qualifications/qualifications.service.js';
import * as coupons from './coupons.service.js';

export function couponsRouter(deps: AppDeps, requireAuth: RequestHandler): Router {
  const router = Router();
  router.use(requireAuth);

  router.get('/', async (req, res) => {
    res.json(await coupons.listCoupons(deps, actorOf(req), couponListQuery.parse(req.query)));
  });

  router.get('/:id', async (req, res) => {
    res.json(await coupons.getCoupon(deps, actorOf(req), pathParam(req, 'id')));
  });

  router.post('/', requireRole('qa_manager'), async (req, res) => {
    res.status(201).json(await coupons.createCoupon(deps, actorOf(req), couponRecordInput.parse(req.body)));
  });

  router.patch('/:id', requireRole('qa_manager'), async (req, res) => {
    res.json(
      await coupons.updateCoupon(deps, actorOf(req), pathParam(req, 'id'), couponUpdateInput.parse(req.body)),
    );
  });

  // Certifying composes the coupon with the qualifications feature.
  router.post('/:id/certify', requireRole('qa_manager'), async (req, res) => {
    res
      .status(201)
      .json(await certifyCoupon(deps, actorOf(req), pathParam(req, 'id'), certifyInput.parse(req.body)));
  });

  return router;
}
