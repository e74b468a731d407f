// Company settings (QA manager): lead times of the lapse warnings, when a continuity month closes, the
// daily time of the lapse-watch run and the company's time zone. Every change is audited.
import type { CompanySettings, CompanySettingsInput } from '@beadroll/rules';
import type { AppDeps } from '../lib/context.js';
import type { Actor } from '../lib/scope.js';
import { diff, recordAudit } from '../lib/audit.js';
import { serverTimeZone, todayIn } from '../lib/dates.js';
import * as repo from './settings.repository.js';

const toBody = (s: repo.CompanySettingsValues, now: Date): CompanySettings => ({
  warnDays: s.warnDays,
  closedMonthAfter: s.closedMonthAfter,
  lapseWatchTime: s.lapseWatchTime,
  timeZone: s.timeZone,
  timeZoneIsServerDefault: s.timeZoneChosen === null,
  serverTimeZone: serverTimeZone(),
  today: todayIn(s.timeZone, now),
  updatedAt: s.updatedAt ? s.updatedAt.toISOString() : null,
});

export async function getSettings(deps: AppDeps, actor: Actor): Promise<CompanySettings> {
  return toBody(await repo.getCompanySettings(deps.dataSource.manager, actor.organizationId), deps.clock.now());
}

export async function updateSettings(
  deps: AppDeps,
  actor: Actor,
  input: CompanySettingsInput,
): Promise<CompanySettings> {
  await deps.dataSource.transaction(async (db) => {
    const now = deps.clock.now();
    // Lock first, then read: two QA managers saving at once each change what the other saved, never
    // a copy read before the other's commit.
    await repo.lockCompanySettings(db, actor.organizationId);
    const current = await repo.getCompanySettings(db, actor.organizationId);
    const before = {
      warnDays: current.warnDays,
      closedMonthAfter: current.closedMonthAfter,
      lapseWatchTime: current.lapseWatchTime,
      timeZone: current.timeZoneChosen,
    };
    const after = {
      ...before,
      ...input,
      ...(input.warnDays ? { warnDays: [...input.warnDays].sort((a, b) => b - a) } : {}),
    };
    const changes = diff(before, after);
    if (changes.changed.length === 0) return;
    await repo.updateCompanySettings(db, actor.organizationId, after, now);
    await recordAudit(db, actor, now, {
      action: 'company-settings.updated',
      entityType: 'company-settings',
      entityId: actor.organizationId,
      before: changes.before,
      after: changes.after,
    });
    deps.logger.info(
      { organizationId: actor.organizationId, by: actor.id, ...changes },
      'company settings changed',
    );
  });
  return getSettings(deps, actor);
}
