// Qualifications with real ranges for the qualified-on and crew-finder tests: a passing coupon with the
// variables given, its qualification with the ranges the rules package computes from them, and logged
// use with who logged it — written straight to PostgreSQL, then the pairs refreshed as the app would.
import type { DataSource } from 'typeorm';
import { qualifiedRanges, type CouponInput } from '@beadroll/rules';
import type { Company, ShopRow, UserRow, WelderRow } from '../../support/factories.js';
import { refreshContinuityStates } from '../../../apps/api/src/continuity/continuity-state.repository.js';

/** ASME IX SMAW, 6G pipe NPS 6 Sch 80 (6.625 in OD, 0.432 in wall), no backing, F-No. 4, uphill. */
export const pipe6G: CouponInput = {
  code: 'asme-ix',
  process: 'SMAW',
  form: 'pipe',
  weld: 'groove',
  position: '6G',
  thickness: { value: 0.432, unit: 'in' },
  outsideDiameter: { value: 6.625, unit: 'in' },
  layers: 3,
  backing: false,
  fNumber: 4,
  progression: 'uphill',
};

/** The auditor's joint: 6 in Sch 80 pipe welded fixed at 45° (6G), no backing, E7018 (F-No. 4), uphill. */
export const joint6inSch80 = {
  form: 'pipe',
  weld: 'groove',
  position: '6G',
  nps: '6',
  schedule: '80',
  backing: 'without',
  fNumber: '4',
  progression: 'uphill',
} as const;

export async function makeProcedureFor(ds: DataSource, org: Company, code = 'asme-ix'): Promise<string> {
  const [row] = await ds.query<{ id: string }[]>(
    `INSERT INTO procedures (organization_id, number, revision, code, processes, status)
     VALUES ($1, 'WPS-' || substr(gen_random_uuid()::text, 1, 6), 'B', $2, '{SMAW,GTAW,GMAW,FCAW}', 'active') RETURNING id`,
    [org.id, code],
  );
  return row!.id;
}

export async function makeQualification(
  ds: DataSource,
  t: {
    org: Company;
    shop: ShopRow;
    welder: WelderRow;
    procedureId: string;
    qa: UserRow;
    testedOn: string;
    coupon?: CouponInput;
    revokedOn?: string;
    revokedReason?: string;
    supersedes?: string;
  },
): Promise<{ couponId: string; qualificationId: string; number: string }> {
  const coupon = t.coupon ?? pipe6G;
  const ranges = qualifiedRanges(coupon);
  const [c] = await ds.query<{ id: string }[]>(
    `INSERT INTO coupons (organization_id, welder_id, shop_id, procedure_id, tested_on, code, process, coupon,
                          examiner, visual, examination, result, rules_version, recorded_by, lab_report_number)
     VALUES ($1, $2, $3, $4, $5, $6, $7, $8, '{"name":"Ivo Testbench"}', 'accept', '{"bend":{"specimens":[]}}',
             'accept', 'test', $9, 'LR-QO-1')
     RETURNING id`,
    [t.org.id, t.welder.id, t.shop.id, t.procedureId, t.testedOn, coupon.code, coupon.process, JSON.stringify(coupon), t.qa.id],
  );
  const [q] = await ds.query<{ id: string; number: string }[]>(
    `INSERT INTO qualifications (organization_id, welder_id, coupon_id, code, process, ranges, certified_on,
                                 certified_by, certified_by_name, rules_version, revoked_on, revoked_reason, revoked_by,
                                 supersedes_id)
     VALUES ($1, $2, $3, $4, $5, $6, $7, $8, 'Quinn Assay', 'test', $9, $10, CASE WHEN $9::date IS NULL THEN NULL ELSE $8::uuid END, $11)
     RETURNING id, number`,
    [t.org.id, t.welder.id, c!.id, coupon.code, coupon.process, JSON.stringify(ranges), t.testedOn, t.qa.id,
     t.revokedOn ?? null, t.revokedOn ? (t.revokedReason ?? 'Cracked root on production weld') : null, t.supersedes ?? null],
  );
  if (t.supersedes)
    await ds.query(`UPDATE qualifications SET superseded_by_id = $2 WHERE id = $1`, [t.supersedes, q!.id]);
  await ds.transaction((db) => refreshContinuityStates(db, t.welder.id, coupon.process));
  return { couponId: c!.id, qualificationId: q!.id, number: q!.number };
}

/** Logged use of the process on a day, by a person. */
export async function logUse(
  ds: DataSource,
  u: { org: Company; shop: ShopRow; welder: WelderRow; process?: string; usedOn: string; job?: string; by: UserRow },
): Promise<string> {
  const process = u.process ?? 'SMAW';
  const [row] = await ds.query<{ id: string }[]>(
    `INSERT INTO continuity_entries (organization_id, welder_id, shop_id, process, month, used_on, job_reference, logged_by)
     VALUES ($1, $2, $3, $4, date_trunc('month', $5::date)::date, $5, $6, $7) RETURNING id`,
    [u.org.id, u.welder.id, u.shop.id, process, u.usedOn, u.job ?? 'HPF-2433', u.by.id],
  );
  await ds.transaction((db) => refreshContinuityStates(db, u.welder.id, process));
  return row!.id;
}
