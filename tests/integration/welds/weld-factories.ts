// Certified qualifications with their real qualified ranges, written straight to PostgreSQL (the coupon
// form and certification have their own tests), and weld bodies for POST /api/welds.
import type { DataSource } from 'typeorm';
import { qualifiedRanges, type CouponInput, type WeldBody } from '@beadroll/rules';
import type { Company, ShopRow, UserRow, WelderRow } from '../../support/factories.js';
import { refreshContinuityState } from '../../../apps/api/src/continuity/continuity-state.repository.js';

/**
 * ASME IX SMAW, plate 3G, 3/8 in with backing, F-No. 4, uphill: groove F and V on plate (and pipe over
 * 24 in), F only on pipe 2-7/8 in to 24 in OD, up to 3/4 in weld metal, pipe 2-7/8 in OD and over, with
 * backing only, F-No. 1–4 with backing (from memory: QW-461.9, QW-452.1(b), QW-452.3, QW-402.4, QW-433,
 * QW-405.3).
 */
export const PLATE_3G: CouponInput = {
  code: 'asme-ix',
  process: 'SMAW',
  form: 'plate',
  weld: 'groove',
  position: '3G',
  thickness: { value: 0.375, unit: 'in' },
  depositedThickness: { value: 0.375, unit: 'in' },
  backing: true,
  fNumber: 4,
  progression: 'uphill',
};

export async function certify(
  ds: DataSource,
  q: {
    org: Company;
    shop: ShopRow;
    welder: WelderRow;
    procedureId: string;
    by: UserRow;
    testedOn: string;
    coupon?: CouponInput;
    revokedOn?: string;
  },
): Promise<string> {
  const coupon = q.coupon ?? PLATE_3G;
  const [c] = await ds.query<{ id: string }[]>(
    `INSERT INTO coupons (organization_id, welder_id, shop_id, procedure_id, tested_on, code, process, coupon,
                          examiner, visual, examination, result, rules_version)
     VALUES ($1, $2, $3, $4, $5, $6, $7, $8, '{"name":"Ivo Testbench"}', 'accept', '{}', 'accept', 'test') RETURNING id`,
    [q.org.id, q.welder.id, q.shop.id, q.procedureId, q.testedOn, coupon.code, coupon.process, JSON.stringify(coupon)],
  );
  const [row] = await ds.query<{ id: string }[]>(
    `INSERT INTO qualifications (organization_id, welder_id, coupon_id, code, process, ranges, certified_on,
                                 certified_by, certified_by_name, rules_version, revoked_on, revoked_reason)
     VALUES ($1, $2, $3, $4, $5, $6, $7, $8, 'Test QA', 'test', $9, CASE WHEN $9::date IS NULL THEN NULL ELSE 'test revocation' END)
     RETURNING id`,
    [q.org.id, q.welder.id, c!.id, coupon.code, coupon.process, JSON.stringify(qualifiedRanges(coupon)), q.testedOn, q.by.id, q.revokedOn ?? null],
  );
  await refreshContinuityState(ds.manager, q.welder.id, coupon.process, coupon.code);
  return row!.id;
}

/** A plate groove joint inside PLATE_3G's ranges, vertical uphill. */
export function weldBody(
  ids: { shopId: string; welderId: string },
  over: Partial<Omit<WeldBody, 'joint'>> & { joint?: Partial<WeldBody['joint']> } = {},
): WeldBody {
  const { joint, ...rest } = over;
  return {
    shopId: ids.shopId,
    jobReference: 'HPF-2433',
    weldNumber: `W-${Math.random().toString(36).slice(2, 8)}`,
    weldedOn: new Date().toISOString().slice(0, 10),
    passes: [{ welderId: ids.welderId, process: 'SMAW', layer: 'all' }],
    ...rest,
    joint: {
      form: 'plate',
      weld: 'groove',
      position: 'V',
      thickness: { value: 0.5, unit: 'in' },
      fNumber: 4,
      backing: true,
      progression: 'uphill',
      ...joint,
    },
  };
}
