// The demo continuity history of Harrow Point Fabrication (all invented): monthly logged use of each
// demo welder's processes from the month after their test up to this month, shaped relative to the day
// the seed runs so the demo stays alive on any date — most pairs current, three lapsing within 30 days
// (their use stopped a little under six months ago), two lapsed (no use since a test more than six months
// ago), one qualification revoked for cause, and one welder renewed by a passing coupon after a lapse.
// The history reaches back as far as the demo tests do (the records seed spreads them over the last two
// years); use before a welder's test would not count, so none is invented.
// Logged use goes through the continuity repository (one upsert per shop and month, audits in one
// statement), the revocation and the renewal coupon through the API's services; every state is
// refreshed once at the end. Idempotent: each step is skipped once its rows exist.
import { addDays, addMonths, couponRecordInput, type CouponRecord } from '@beadroll/rules';
import type { AppDeps } from '../lib/context.js';
import type { Actor } from '../lib/scope.js';
import { isoDay } from '../lib/dates.js';
import { loadActor } from '../auth/auth.repository.js';
import { createCoupon, getCoupon } from '../coupons/coupons.service.js';
import { certifyCoupon, revokeQualification } from '../qualifications/qualifications.service.js';
import { insertEntryAudits, upsertCells } from '../continuity/continuity.repository.js';
import { refreshAllContinuityStates } from '../continuity/continuity-state.repository.js';

export type ContinuitySeedResult = { continuityEntries: number; revocations: number; renewals: number };

interface Pair {
  welderId: string;
  stamp: string;
  homeShopId: string;
  process: string;
  code: string;
  lastTest: string;
  lapsesOn: string;
  coupons: number;
}

/** Codes whose window runs from the day of the last use (so "lapses within 30 days" exists on every date). */
const dayCounted = new Set(['asme-ix', 'aws-d1.1']);
const jobs = ['HPF-2417', 'HPF-2420', 'HPF-2433', 'HPF-2441', 'HPF-2458', 'HPF-2462', 'TRV-118', 'TRV-131'];
const RENEWAL_LAB = 'RN';

const monthsBetween = (fromMonth: string, toMonth: string): string[] => {
  const out: string[] = [];
  for (let m = `${fromMonth}-01`; m.slice(0, 7) <= toMonth; m = addMonths(m, 1)) out.push(m.slice(0, 7));
  return out;
};

export async function seedContinuity(
  deps: AppDeps,
  organizationId: string,
  qaUserId: string,
): Promise<ContinuitySeedResult> {
  const r: ContinuitySeedResult = { continuityEntries: 0, revocations: 0, renewals: 0 };
  const db = deps.dataSource.manager;
  const actor: Actor | null = await loadActor(db, qaUserId);
  if (!actor) throw new Error('The demo QA manager cannot sign in; seed the foundation first');
  const today = isoDay(deps.clock.now());

  const [done] = await db.query<{ entries: boolean; revoked: boolean; renewed: boolean }[]>(
    `SELECT EXISTS (SELECT 1 FROM continuity_entries WHERE organization_id = $1) AS entries,
            EXISTS (SELECT 1 FROM qualifications WHERE organization_id = $1 AND revoked_on IS NOT NULL) AS revoked,
            EXISTS (SELECT 1 FROM coupons WHERE organization_id = $1 AND lab_report_number LIKE '%-${RENEWAL_LAB}') AS renewed`,
    [organizationId],
  );
  if (done?.entries && done.revoked && done.renewed) return r;

  await refreshAllContinuityStates(db, organizationId);
  const pairs = await db.query<Pair[]>(
    `SELECT s.welder_id AS "welderId", w.stamp, w.home_shop_id AS "homeShopId", s.process, s.code,
            to_char(s.last_test, 'YYYY-MM-DD') AS "lastTest", to_char(s.lapses_on, 'YYYY-MM-DD') AS "lapsesOn",
            (SELECT count(*)::int FROM coupons c WHERE c.welder_id = w.id) AS coupons
       FROM continuity_states s JOIN welders w ON w.id = s.welder_id
      WHERE s.organization_id = $1 AND w.active
      ORDER BY s.last_test, w.stamp, s.process, s.code`,
    [organizationId],
  );

  // The scenario of each pair, from the oldest test on (PV-07, the demo welder, stays current).
  const lapsingLastUse = addDays(addMonths(today, -6), 12);
  const role = new Map<Pair, 'renewed' | 'lapsed' | 'lapsing' | 'revoked' | 'current'>();
  const renewedWelders = new Set<string>();
  const count = (x: string) => [...role.values()].filter((v) => v === x).length;
  for (const p of pairs) {
    const eligible = p.stamp !== 'PV-07' && dayCounted.has(p.code);
    if (eligible && count('renewed') < 1 && p.coupons <= 3 && p.lapsesOn <= addDays(today, -8)) {
      role.set(p, 'renewed');
      renewedWelders.add(p.welderId);
    } else if (eligible && count('lapsed') < 2 && p.lapsesOn <= addDays(today, -1)) role.set(p, 'lapsed');
    else if (
      eligible &&
      count('lapsing') < 3 &&
      (p.lastTest < addDays(lapsingLastUse, -20) || (p.lapsesOn > today && p.lapsesOn <= addDays(today, 28)))
    )
      role.set(p, 'lapsing');
    else role.set(p, 'current');
  }
  // The revoked one: a current pair of a welder without another scenario, tested at least two months ago.
  const revokedPair = pairs.find(
    (p) =>
      role.get(p) === 'current' &&
      p.stamp !== 'PV-07' &&
      p.lastTest <= addDays(today, -60) &&
      !renewedWelders.has(p.welderId) &&
      pairs.every((o) => o.welderId !== p.welderId || role.get(o) === 'current'),
  );
  if (revokedPair) role.set(revokedPair, 'revoked');

  if (!done?.entries) {
    // Monthly use from the month after the test: up to today (current, revoked — revoked from a date, its
    // earlier use stays on record), up to a last use a little under six months ago (lapsing), none (lapsed,
    // renewed: the gap is what lapses them).
    const byShopMonth = new Map<string, { welderId: string; process: string; usedOn: string; jobReference: string; note: string }[]>();
    pairs.forEach((p, i) => {
      const scenario = role.get(p);
      if (scenario === 'lapsed' || scenario === 'renewed') return;
      // A lapsing pair tested long enough ago logs use until a little under six months ago; one tested
      // just over five months ago lapses from its test alone, so it logs nothing.
      if (scenario === 'lapsing' && p.lastTest >= addDays(lapsingLastUse, -20)) return;
      const until = scenario === 'lapsing' ? lapsingLastUse : today;
      const firstMonth = addMonths(`${p.lastTest.slice(0, 7)}-01`, 1).slice(0, 7);
      const months = monthsBetween(firstMonth, until.slice(0, 7));
      // A lapsing pair always ends with its last use (even in its test's month).
      if (scenario === 'lapsing' && months.length === 0) months.push(until.slice(0, 7));
      months.forEach((month, k) => {
        const day = 1 + ((i * 5 + k * 3) % 24);
        let usedOn = `${month}-${String(day).padStart(2, '0')}`;
        if (usedOn > until) usedOn = month === until.slice(0, 7) ? until : usedOn;
        if (scenario === 'lapsing' && month === until.slice(0, 7)) usedOn = until;
        const key = `${p.homeShopId}|${month}`;
        const cells = byShopMonth.get(key) ?? [];
        cells.push({
          welderId: p.welderId,
          process: p.process,
          usedOn,
          jobReference: jobs[(i + k) % jobs.length]!,
          note: (i + k) % 11 === 3 ? 'Repair welds on the nozzle reinforcement' : '',
        });
        byShopMonth.set(key, cells);
      });
    });
    const at = deps.clock.now();
    await deps.dataSource.transaction(async (tx) => {
      for (const [key, cells] of byShopMonth) {
        const [shopId, month] = key.split('|') as [string, string];
        const written = await upsertCells(
          tx,
          { organizationId, shopId, month: `${month}-01`, loggedBy: actor.id, at },
          cells,
        );
        await insertEntryAudits(
          tx,
          actor,
          at,
          written.map(({ id, welderId: _w, version: _v, inserted: _i, ...after }) => ({
            action: 'continuity-entry.created',
            entityId: id,
            before: null,
            after: { ...after, shopId, welderId: _w },
          })),
        );
        r.continuityEntries += written.length;
      }
      await refreshAllContinuityStates(tx, organizationId);
    });
  }

  if (!done?.revoked && revokedPair) {
    const [q] = await db.query<{ id: string }[]>(
      `SELECT id FROM qualifications
        WHERE welder_id = $1 AND process = $2 AND code = $3 AND superseded_by_id IS NULL ORDER BY certified_on DESC LIMIT 1`,
      [revokedPair.welderId, revokedPair.process, revokedPair.code],
    );
    if (q) {
      await revokeQualification(deps, actor, q.id, {
        revokedOn: addDays(today, -20),
        reason: 'Production radiography on traveler TRV-131 showed repeated lack of fusion; retraining and retest required',
      });
      r.revocations++;
    }
  }

  const renewedPair = pairs.find((p) => role.get(p) === 'renewed');
  if (!done?.renewed && renewedPair) {
    // A retest of the same process after the lapse: the passing coupon renews the lapsed qualification.
    const [last] = await db.query<{ id: string }[]>(
      `SELECT id FROM coupons WHERE welder_id = $1 AND process = $2 AND code = $3 AND result = 'accept'
        ORDER BY tested_on DESC LIMIT 1`,
      [renewedPair.welderId, renewedPair.process, renewedPair.code],
    );
    const [wps] = await db.query<{ id: string }[]>(
      `SELECT id FROM procedures WHERE organization_id = $1 AND code = $2 AND status = 'active' AND $3 = ANY (processes)
        ORDER BY number, revision LIMIT 1`,
      [organizationId, renewedPair.code, renewedPair.process],
    );
    if (last && wps) {
      const before: CouponRecord = await getCoupon(deps, actor, last.id);
      const testedOn = addDays(today, -5);
      const coupon = await createCoupon(
        deps,
        actor,
        couponRecordInput.parse({
          welderId: renewedPair.welderId,
          shopId: before.shop.id,
          procedureId: wps.id,
          testedOn,
          coupon: before.coupon,
          pipe: before.pipe,
          pNumbers: before.pNumbers,
          examiner: before.examiner,
          labReportNumber: `HPL-${renewedPair.stamp}-${RENEWAL_LAB}`,
          visual: 'accept',
          examination: { method: 'radiography', result: 'accept', reportNumber: `RT-HPL-${renewedPair.stamp}-${RENEWAL_LAB}` },
          notes: 'Retest after the qualification lapsed for lack of use.',
        }),
      );
      if (coupon.result === 'accept') {
        await certifyCoupon(deps, actor, coupon.id, { certifiedOn: addDays(testedOn, 2), version: coupon.version });
        r.renewals++;
      }
    }
  }
  return r;
}
