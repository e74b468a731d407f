// Company settings: one row per company, or none (then the defaults hold). getCompanySettings is the
// one way other features (the continuity log, qualification status) read them.
import type { EntityManager } from 'typeorm';
import { DEFAULT_COMPANY_SETTINGS, type CompanySettingsInput } from '@beadroll/rules';

export interface CompanySettingsValues {
  /** Lead times in days, largest first. */
  warnDays: number[];
  closedMonthAfter: number;
  lapseWatchTime: string;
  updatedAt: Date | null;
}

const defaults = (): CompanySettingsValues => ({
  warnDays: [...DEFAULT_COMPANY_SETTINGS.warnDays],
  closedMonthAfter: DEFAULT_COMPANY_SETTINGS.closedMonthAfter,
  lapseWatchTime: DEFAULT_COMPANY_SETTINGS.lapseWatchTime,
  updatedAt: null,
});

const byLargest = (days: number[]) => [...days].sort((a, b) => b - a);

export async function getCompanySettings(
  db: EntityManager,
  organizationId: string,
): Promise<CompanySettingsValues> {
  const [row] = await db.query<
    { warnDays: number[]; closedMonthAfter: number; lapseWatchTime: string; updatedAt: Date }[]
  >(
    `SELECT warn_days AS "warnDays", closed_month_after AS "closedMonthAfter",
            lapse_watch_time AS "lapseWatchTime", updated_at AS "updatedAt"
       FROM company_settings WHERE organization_id = $1`,
    [organizationId],
  );
  return row ? { ...row, warnDays: byLargest(row.warnDays) } : defaults();
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
      updatedAt: Date | null;
    }[]
  >(
    `SELECT o.id, s.warn_days AS "warnDays", s.closed_month_after AS "closedMonthAfter",
            s.lapse_watch_time AS "lapseWatchTime", s.updated_at AS "updatedAt"
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
        updatedAt: r.updatedAt,
      },
    ]),
  );
}

/** Row lock on the company's settings (creating the row with the defaults first), for an update. */
export async function lockCompanySettings(db: EntityManager, organizationId: string, at: Date) {
  await db.query(
    `INSERT INTO company_settings (organization_id, updated_at) VALUES ($1, $2) ON CONFLICT (organization_id) DO NOTHING`,
    [organizationId, at],
  );
  await db.query(`SELECT 1 FROM company_settings WHERE organization_id = $1 FOR UPDATE`, [organizationId]);
}

export async function updateCompanySettings(
  db: EntityManager,
  organizationId: string,
  values: Required<CompanySettingsInput>,
  at: Date,
): Promise<void> {
  await db.query(
    `UPDATE company_settings SET warn_days = $2, closed_month_after = $3, lapse_watch_time = $4, updated_at = $5
      WHERE organization_id = $1`,
    [organizationId, values.warnDays, values.closedMonthAfter, values.lapseWatchTime, at],
  );
}
