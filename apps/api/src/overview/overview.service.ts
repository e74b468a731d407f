// The Overview (QA manager: every shop; foreman: their shops): counts by state per shop, lapses due in
// the next 90 days by week, the review queue, the latest lapse-watch run and given-up deliveries.
import type { Overview } from '@beadroll/rules';
import type { AppDeps } from '../lib/context.js';
import type { Actor } from '../lib/scope.js';
import { companyToday } from '../settings/settings.repository.js';
import * as repo from './overview.repository.js';

const HORIZON_DAYS = 90;

export async function getOverview(deps: AppDeps, actor: Actor): Promise<Overview> {
  const db = deps.dataSource.manager;
  // The session lookup brought the company's zone along: today costs no query.
  const asOf = await companyToday(db, actor, deps.clock);
  const { counts, lapsesByWeek, reviewQueue, failedDeliveries, latestRun } = await repo.overviewNumbers(
    db,
    actor,
    asOf,
    HORIZON_DAYS,
  );
  return { asOf, counts, lapsesByWeek, reviewQueue, latestRun, failedDeliveries };
}
