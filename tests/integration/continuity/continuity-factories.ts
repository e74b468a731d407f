// Qualification histories written straight to PostgreSQL for the continuity tests: a WPS, a passing
// coupon and its certified qualification, and logged use — without going through the coupon form.
import type { DataSource } from 'typeorm';
import type { Company, ShopRow, UserRow, WelderRow } from '../../support/factories.js';

export async function makeContinuityProcedure(ds: DataSource, org: Company) {
  const [row] = await ds.query<{ id: string }[]>(
    `INSERT INTO procedures (organization_id, number, revision, code, processes, status)
     VALUES ($1, 'CONT-' || substr(gen_random_uuid()::text, 1, 8), 'A', 'asme-ix', '{SMAW,GTAW}', 'active') RETURNING id`,
    [org.id],
  );
  return row!.id;
}

/** A passing (or failing) coupon of the welder; certified as a qualification when `certify` is set. */
export async function makeTest(
  ds: DataSource,
  t: {
    org: Company;
    shop: ShopRow;
    welder: WelderRow;
    procedureId: string;
    certifiedBy: UserRow;
    code: string;
    process: string;
    testedOn: string;
    certify?: boolean;
    result?: 'accept' | 'reject';
    revokedOn?: string;
  },
): Promise<{ couponId: string; qualificationId: string | null }> {
  const [c] = await ds.query<{ id: string }[]>(
    `INSERT INTO coupons (organization_id, welder_id, shop_id, procedure_id, tested_on, code, process, coupon,
                          examiner, visual, examination, result, rules_version)
     VALUES ($1, $2, $3, $4, $5, $6, $7, '{}', '{"name":"Ivo Testbench"}', 'accept', '{}', $8, 'test')
     RETURNING id`,
    [t.org.id, t.welder.id, t.shop.id, t.procedureId, t.testedOn, t.code, t.process, t.result ?? 'accept'],
  );
  if (!t.certify) return { couponId: c!.id, qualificationId: null };
  const [q] = await ds.query<{ id: string }[]>(
    `INSERT INTO qualifications (organization_id, welder_id, coupon_id, code, process, ranges, certified_on,
                                 certified_by, certified_by_name, rules_version, revoked_on, revoked_reason)
     VALUES ($1, $2, $3, $4, $5, '{}', $6, $7, 'Test QA', 'test', $8, CASE WHEN $8::date IS NULL THEN NULL ELSE 'test revocation' END)
     RETURNING id`,
    [t.org.id, t.welder.id, c!.id, t.code, t.process, t.testedOn, t.certifiedBy.id, t.revokedOn ?? null],
  );
  return { couponId: c!.id, qualificationId: q!.id };
}

/** One logged use (unique per welder, process, shop and month). */
export async function makeUse(
  ds: DataSource,
  u: { org: Company; shop: ShopRow; welder: WelderRow; process: string; usedOn: string; job?: string },
) {
  await ds.query(
    `INSERT INTO continuity_entries (organization_id, welder_id, shop_id, process, month, used_on, job_reference)
     VALUES ($1, $2, $3, $4, date_trunc('month', $5::date)::date, $5, $6)`,
    [u.org.id, u.welder.id, u.shop.id, u.process, u.usedOn, u.job ?? 'J-1'],
  );
}
