// GET /api/welders/:id/qualified-on?date=&process=&code=&form=&weld=&position=&thickness=&… — was the welder
// qualified for this joint on that day, with the proof. Whoever may see the welder may ask.
import { Router, type RequestHandler } from 'express';
import { qualifiedOnQuery } from '@beadroll/rules';
import type { AppDeps } from '../lib/context.js';
import { pathParam } from '../lib/params.js';
import { actorOf } from '../lib/auth.js';
import { assertWelderInScope, qualifiedOn } from './qualified-on.service.js';

/** Mounted at /api/welders. */
export function welderQualifiedOnRouter(deps: AppDeps, requireAuth: RequestHandler): Router {
  const router = Router();
  router.get('/:id/qualified-on', requireAuth, async (req, res) => {
    const actor = actorOf(req);
    const id = pathParam(req, 'id');
    // The welder first: someone who may not see the welder learns nothing from the query's errors.
    await assertWelderInScope(deps.dataSource.manager, actor, id);
    res.json(await qualifiedOn(deps, actor, id, qualifiedOnQuery.parse(req.query)));
  });
  return router;
}
