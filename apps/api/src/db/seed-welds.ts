// The demo production welds of Harrow Point Fabrication (all invented): two jobs logged through the weld
// log's own service, so each weld is checked on entry like any other. Job HPF-2433 (nozzles of a vessel, in
// Vessel Bay) is six pipe welds by the welder of the demo's SMAW 6G pipe qualification, one of them on a
// wall thicker than the qualification allows, so it is flagged and waits in the review queue; job TRV-131
// (a stair frame, in Structural Hall) is five plate welds by an FCAW welder, root and fill by two welders
// on one of them. Joints are taken from each welder's own test coupon, so they stay inside the ranges on
// any day the seed runs. Idempotent: skipped once the company has welds.
import { addDays, type Coupon, type WeldInput } from '@beadroll/rules';
import type { AppDeps } from '../lib/context.js';
import { isoDay } from '../lib/dates.js';
import { loadActor } from '../auth/auth.repository.js';
import { createWeld } from '../welds/welds.service.js';

interface Held {
  welderId: string;
  stamp: string;
  shopCode: string;
  shopId: string;
  procedureId: string;
  coupon: Coupon;
}

/** Welders whose qualification of the code and process is in force today (not revoked, not lapsed), with their coupon. */
async function heldInForce(deps: AppDeps, organizationId: string, code: string, process: string, form: string, today: string) {
  return deps.dataSource.manager.query<Held[]>(
    `SELECT q.welder_id AS "welderId", w.stamp, s.code AS "shopCode", s.id AS "shopId", c.procedure_id AS "procedureId",
            c.coupon
       FROM qualifications q JOIN coupons c ON c.id = q.coupon_id JOIN welders w ON w.id = q.welder_id
       JOIN shops s ON s.id = w.home_shop_id
       JOIN continuity_states cs ON (cs.welder_id, cs.process, cs.code) = (q.welder_id, q.process, q.code)
      WHERE q.organization_id = $1 AND q.code = $2 AND q.process = $3 AND c.coupon->>'form' = $4
        AND q.revoked_on IS NULL AND q.superseded_by_id IS NULL AND w.active
        AND cs.lapses_on > $5::date + 10 AND c.tested_on < $5::date - 40
      ORDER BY w.stamp`,
    [organizationId, code, process, form, today],
  );
}

/**
 * The position a plate joint is welded in, taken from the coupon's own test position (1G/1F flat, 2G/2F
 * horizontal, 3G/3F vertical, 4G/4F overhead), so the joint is inside the coupon's positions whichever
 * welder holds the qualification on the day the seed runs; pipe joints are welded flat (rolled).
 */
function positionOf(c: Coupon): WeldInput['joint']['position'] {
  if (c.form === 'pipe') return 'F';
  const byDigit = { '1': 'F', '2': 'H', '3': 'V', '4': 'O' } as const;
  return byDigit[c.position.charAt(0) as keyof typeof byDigit] ?? 'F';
}

const jointOf = (c: Coupon, over: Partial<WeldInput['joint']> = {}): WeldInput['joint'] => ({
  form: c.form,
  weld: c.weld,
  position: positionOf(c),
  thickness: c.depositedThickness ?? c.thickness,
  ...(c.outsideDiameter ? { outsideDiameter: c.outsideDiameter } : {}),
  ...(c.fNumber ? { fNumber: c.fNumber } : {}),
  backing: c.backing,
  ...(c.progression ? { progression: c.progression } : {}),
  ...over,
});

export async function seedWelds(deps: AppDeps, organizationId: string, qaUserId: string): Promise<number> {
  const db = deps.dataSource.manager;
  const [{ n } = { n: 0 }] = await db.query<{ n: number }[]>(
    `SELECT count(*)::int AS n FROM welds WHERE organization_id = $1`,
    [organizationId],
  );
  if (n > 0) return 0;
  const actor = await loadActor(db, qaUserId);
  if (!actor) throw new Error('The demo QA manager cannot sign in; seed the foundation first');
  const today = isoDay(deps.clock.now());
  let made = 0;
  const log = async (w: Omit<WeldInput, 'note'> & { note?: string }) => {
    await createWeld(deps, actor, { note: '', ...w });
    made++;
  };

  const pipe = (await heldInForce(deps, organizationId, 'asme-ix', 'SMAW', 'pipe', today))[0];
  if (pipe) {
    const c = pipe.coupon;
    const wall = c.thickness;
    for (let i = 1; i <= 6; i++)
      await log({
        shopId: pipe.shopId,
        jobReference: 'HPF-2433',
        weldNumber: `N${i}`,
        weldedOn: addDays(today, -(20 - i * 2)),
        procedureId: pipe.procedureId,
        // N5 joins the nozzle to a heavier forged neck: 0.75 in of weld metal, over twice the coupon's.
        joint: jointOf(c, i === 5 ? { thickness: { value: 0.75, unit: 'in' } } : { thickness: wall }),
        passes: [{ welderId: pipe.welderId, process: 'SMAW', layer: 'all' }],
        examination: i === 2 ? { method: 'RT', reportNumber: 'RT-24-0173', result: 'accepted' } : null,
        note: i === 5 ? 'Nozzle N5 to forged neck' : '',
      });
  }

  const plates = await heldInForce(deps, organizationId, 'aws-d1.1', 'FCAW', 'plate', today);
  const first = plates[0];
  if (first) {
    const second = plates[1];
    for (let i = 1; i <= 5; i++)
      await log({
        shopId: first.shopId,
        jobReference: 'TRV-131',
        weldNumber: `S-${String(i).padStart(2, '0')}`,
        weldedOn: addDays(today, -(12 - i * 2)),
        procedureId: first.procedureId,
        joint: jointOf(first.coupon),
        passes:
          i === 3 && second
            ? [
                { welderId: first.welderId, process: 'FCAW', layer: 'root' },
                { welderId: second.welderId, process: 'FCAW', layer: 'fill' },
              ]
            : [{ welderId: first.welderId, process: 'FCAW', layer: 'all' }],
        examination: i === 1 ? { method: 'visual', reportNumber: '', result: 'accepted' } : null,
      });
  }
  return made;
}
