// /api/lapse-watch (QA manager): preview, run now, run history, notices with their deliveries.
import { Router, type RequestHandler } from 'express';
import { lapseWatchNoticesQuery, lapseWatchPreviewQuery, lapseWatchRunInput } from '@beadroll/rules';
import type { AppDeps } from '../lib/context.js';
import { actorOf, requireRole } from '../lib/auth.js';
import { runLapseWatch } from '../jobs/lapse-watch.job.js';
import * as lapseWatch from './lapse-watch.service.js';
import { recordAudit } from '../lib/audit.js';

export function lapseWatchRouter(deps: AppDeps, requireAuth: RequestHandler): Router {
  const router = Router();
  router.use(requireAuth, requireRole('qa_manager'));

  router.get('/preview', async (req, res) => {
    const { asOf } = lapseWatchPreviewQuery.parse(req.query);
    res.json(await lapseWatch.preview(deps, actorOf(req), asOf));
  });

  router.post('/runs', async (req, res) => {
    const { asOf } = lapseWatchRunInput.parse(req.body ?? {});
    const actor = actorOf(req);
    const [run] = await runLapseWatch(deps, {
      ...(asOf ? { asOf } : {}),
      trigger: 'manual',
      organizationIds: [actor.organizationId],
    });
    // Who ran it by hand, and with what outcome, goes to the audit trail like every other change.
    if (run)
      await recordAudit(deps.dataSource.manager, actor, deps.clock.now(), {
        action: 'lapse-watch.run',
        entityType: 'lapse-watch-run',
        entityId: run.id,
        before: null,
        after: { asOf: run.asOf, status: run.status, noticesCreated: run.noticesCreated },
      });
    res.status(201).json(run);
  });

  router.get('/runs', async (req, res) => {
    res.json(await lapseWatch.listRuns(deps, actorOf(req)));
  });

  router.get('/notices', async (req, res) => {
    const { status } = lapseWatchNoticesQuery.parse(req.query);
    res.json(await lapseWatch.listNotices(deps, actorOf(req), status));
  });

  return router;
}
