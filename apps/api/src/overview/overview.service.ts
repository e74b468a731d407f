// The Overview (QA manager: every shop; foreman: their shops): counts by state per shop, lapses due in
// the next 90 days by week, the review queue, the latest lapse-watch run and given-up deliveries.
import type { Overview } from '@beadroll/rules';
import type { AppDeps } from '../lib/context.js';
import type { Actor } from '../lib/scope.js';
import { getCompanySettings } from '../settings/settings.repository.js';
import { todayIn } from '../lib/dates.js';
import { latestRun } from '../lapse-watch/lapse-watch.service.js';
import * as repo from './overview.repository.js';

const HORIZON_DAYS = 90;

export async function getOverview(deps: AppDeps, actor: Actor): Promise<Overview> {
  const db = deps.dataSource.manager;
  const settings = await getCompanySettings(db, actor.organizationId);
  const asOf = todayIn(settings.timeZone, deps.clock);
  const [counts, lapsesByWeek, reviewQueue, run, failedDeliveries] = await Promise.all([
    repo.countsByShop(db, actor, asOf, Math.max(...settings.warnDays)),
    repo.lapsesByWeek(db, actor, asOf, HORIZON_DAYS),
    repo.reviewQueue(db, actor),
    latestRun(deps, actor.organizationId),
    repo.failedDeliveries(db, actor),
  ]);
  return { asOf, counts, lapsesByWeek, reviewQueue, latestRun: run, failedDeliveries };
}
