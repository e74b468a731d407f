// Company settings: one row per company, or none (then the defaults hold). getCompanySettings is the
// one way other features (the continuity log, qualification status) read them.
import type { EntityManager } from 'typeorm';
import { DEFAULT_COMPANY_SETTINGS, type CompanySettingsInput } from '@beadroll/rules';
import type { Clock } from '../lib/context.js';
import { isTimeZone, serverTimeZone, todayIn } from '../lib/dates.js';

export interface CompanySettingsValues {
  /** Lead times in days, largest first. */
  warnDays: number[];
  closedMonthAfter: number;
  lapseWatchTime: string;
  /** The zone chosen in Settings, or null: the server's zone. */
  timeZoneChosen: string | null;
  /** The zone in force: the chosen one or the server's. */
  timeZone: string;
  updatedAt: Date | null;
}

const defaults = (): CompanySettingsValues => ({
  warnDays: [...DEFAULT_COMPANY_SETTINGS.warnDays],
  closedMonthAfter: DEFAULT_COMPANY_SETTINGS.closedMonthAfter,
  lapseWatchTime: DEFAULT_COMPANY_SETTINGS.lapseWatchTime,
  timeZoneChosen: null,
  timeZone: serverTimeZone(),
  updatedAt: null,
});

/** A zone stored before this runtime stopped knowing it falls back to the server's, never throws. */
export const zoneInForce = (chosen: string | null) => (chosen && isTimeZone(chosen) ? chosen : serverTimeZone());

const byLargest = (days: number[]) => [...days].sort((a, b) => b - a);

export async function getCompanySettings(
  db: EntityManager,
  organizationId: string,
): Promise<CompanySettingsValues> {
  const [row] = await db.query<
    {
      warnDays: number[];
      closedMonthAfter: number;
      lapseWatchTime: string;
      timeZoneChosen: string | null;
      updatedAt: Date;
    }[]
  >(
    `SELECT warn_days AS "warnDays", closed_month_after AS "closedMonthAfter",
            lapse_watch_time AS "lapseWatchTime", time_zone AS "timeZoneChosen", updated_at AS "updatedAt"
       FROM company_settings WHERE organization_id = $1`,
    [organizationId],
  );
  return row
    ? { ...row, warnDays: byLargest(row.warnDays), timeZone: zoneInForce(row.timeZoneChosen) }
    : defaults();
}

/** The company's time zone in force (its own, or the server's). */
export async function companyTimeZone(db: EntityManager, organizationId: string): Promise<string> {
  const [row] = await db.query<{ zone: string | null }[]>(
    `SELECT time_zone AS zone FROM company_settings WHERE organization_id = $1`,
    [organizationId],
  );
  return zoneInForce(row?.zone ?? null);
}

/**
 * Today's date for the caller's company: the date on its own wall clock at the clock's now. The zone
 * comes with the session when it was loaded there (no query), else from the settings.
 */
export async function companyToday(
  db: EntityManager,
  who: string | { organizationId: string; timeZone?: string | null },
  clock: Clock,
): Promise<string> {
  if (typeof who !== 'string' && who.timeZone !== undefined) return todayIn(zoneInForce(who.timeZone), clock);
  return todayIn(await companyTimeZone(db, typeof who === 'string' ? who : who.organizationId), clock);
}

/** Settings of every company at once (the lapse-watch job and the schedule). */
export async function settingsOfCompanies(
  db: EntityManager,
  organizationIds: string[] | null,
): Promise<Map<string, CompanySettingsValues>> {
  const rows = await db.query<
    {
      id: string;
      warnDays: number[] | null;
      closedMonthAfter: number | null;
      lapseWatchTime: string | null;
      timeZoneChosen: string | null;
      updatedAt: Date | null;
    }[]
  >(
    `SELECT o.id, s.warn_days AS "warnDays", s.closed_month_after AS "closedMonthAfter",
            s.lapse_watch_time AS "lapseWatchTime", s.time_zone AS "timeZoneChosen", s.updated_at AS "updatedAt"
       FROM organizations o LEFT JOIN company_settings s ON s.organization_id = o.id
      WHERE $1::uuid[] IS NULL OR o.id = ANY($1::uuid[])
      ORDER BY o.created_at, o.id`,
    [organizationIds],
  );
  const d = defaults();
  return new Map(
    rows.map((r) => [
      r.id,
      {
        warnDays: byLargest(r.warnDays ?? d.warnDays),
        closedMonthAfter: r.closedMonthAfter ?? d.closedMonthAfter,
        lapseWatchTime: r.lapseWatchTime ?? d.lapseWatchTime,
        timeZoneChosen: r.timeZoneChosen,
        timeZone: zoneInForce(r.timeZoneChosen),
        updatedAt: r.updatedAt,
      },
    ]),
  );
}

/**
 * Serializes changes to one company's settings for the rest of the caller's transaction (taken before
 * the current values are read). An advisory lock, because a company on the defaults has no row to lock.
 */
export async function lockCompanySettings(db: EntityManager, organizationId: string): Promise<void> {
  await db.query(`SELECT pg_advisory_xact_lock(hashtextextended('company-settings:' || $1, 0))`, [organizationId]);
}

export async function updateCompanySettings(
  db: EntityManager,
  organizationId: string,
  values: Required<CompanySettingsInput>,
  at: Date,
): Promise<void> {
  await db.query(
    `INSERT INTO company_settings (organization_id, warn_days, closed_month_after, lapse_watch_time, time_zone, updated_at)
     VALUES ($1, $2, $3, $4, $5, $6)
     ON CONFLICT (organization_id) DO UPDATE SET warn_days = EXCLUDED.warn_days,
            closed_month_after = EXCLUDED.closed_month_after, lapse_watch_time = EXCLUDED.lapse_watch_time,
            time_zone = EXCLUDED.time_zone, updated_at = EXCLUDED.updated_at`,
    [organizationId, values.warnDays, values.closedMonthAfter, values.lapseWatchTime, values.timeZone, at],
  );
}
