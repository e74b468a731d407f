// The rules-agreement test: a few hundred random qualification histories (seeded, so a failure can be
// replayed) with back-dated entries, gaps over six months, renewals, revocations and every code. For a
// range of asOf, the stored continuity state (maintained per pair), the full set-based recompute and the
// rules package's continuityStatus must agree on every row.
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { addDays, addMonths, codeIds, continuityStatus, type ContinuityEvidence } from '@beadroll/rules';
import { startTestApi, type TestApi } from '../../support/api-app.js';
import { makeCompany, makeShop, makeUser, makeWelder, type WelderRow } from '../../support/factories.js';
import {
  recomputeAll,
  refreshContinuityState,
  storedStates,
  type RecomputedState,
} from '../../../apps/api/src/continuity/continuity-state.repository.js';
import { qualificationStatus } from '../../../apps/api/src/qualifications/qualifications.service.js';
import { makeContinuityProcedure, makeTest, makeUse } from './continuity-factories.js';

// mulberry32: a small seeded PRNG (common practice (no source)).
function prng(seed: number) {
  let a = seed >>> 0;
  return () => {
    a = (a + 0x6d2b79f5) >>> 0;
    let t = a;
    t = Math.imul(t ^ (t >>> 15), t | 1);
    t ^= t + Math.imul(t ^ (t >>> 7), t | 61);
    return ((t ^ (t >>> 14)) >>> 0) / 4294967296;
  };
}

/** A piece of evidence as written: a passing coupon (of a code, certified or not) or logged use. */
type Written = { date: string; kind: 'coupon'; code: string; certified: boolean } | { date: string; kind: 'use' };

interface History {
  welder: WelderRow;
  process: string;
  quals: { code: string; testedOn: string; revokedOn?: string; id?: string }[];
  written: Written[];
}

/** The evidence of one (welder, process, code) pair (TRADE.md §9): a certified coupon of the code is a
 *  test, any other passing coupon of the process is use, logged use is use. */
const evidenceFor = (h: History, code: string): ContinuityEvidence[] =>
  h.written.map((e) => ({ date: e.date, kind: e.kind === 'coupon' && e.certified && e.code === code ? 'test' : 'use' }));

const SEED = 20251204;
const HISTORIES = 300;

describe('continuity: stored state, full recompute and continuityStatus agree', () => {
  let api: TestApi;
  beforeAll(async () => {
    api = await startTestApi();
  });
  afterAll(() => api.close());

  it(`agrees on every row for ${HISTORIES} random histories (seed ${SEED}) over a range of asOf`, async () => {
    const rnd = prng(SEED);
    const pick = <T>(xs: readonly T[]) => xs[Math.floor(rnd() * xs.length)] as T;
    const ds = api.ds;
    const org = await makeCompany(ds);
    const shops = [await makeShop(ds, org, 'R1'), await makeShop(ds, org, 'R2')];
    const qa = await makeUser(ds, org, { role: 'qa_manager' });
    const wps = await makeContinuityProcedure(ds, org);
    const histories: History[] = [];

    for (let i = 0; i < HISTORIES; i++) {
      const welder = await makeWelder(ds, org, shops[i % 2]!, { stamp: `R-${i}` });
      const process = pick(['SMAW', 'GTAW']);
      const start = addDays('2019-01-01', Math.floor(rnd() * 900));
      const h: History = { welder, process, quals: [], written: [] };
      h.quals.push({ code: pick(codeIds), testedOn: start });
      // A second code on the same process shares the evidence.
      if (rnd() < 0.2) h.quals.push({ code: pick(codeIds.filter((c) => c !== h.quals[0]!.code)), testedOn: addDays(start, Math.floor(rnd() * 200)) });
      if (rnd() < 0.1) h.quals[0]!.revokedOn = addDays(start, 100 + Math.floor(rnd() * 900));
      await makeTest(ds, { org, shop: shops[0]!, welder, procedureId: wps, certifiedBy: qa, code: h.quals[0]!.code, process, testedOn: start, certify: true, ...(h.quals[0]!.revokedOn ? { revokedOn: h.quals[0]!.revokedOn } : {}) });
      h.written.push({ date: start, kind: 'coupon', code: h.quals[0]!.code, certified: true });
      if (h.quals[1]) {
        await makeTest(ds, { org, shop: shops[0]!, welder, procedureId: wps, certifiedBy: qa, code: h.quals[1].code, process, testedOn: h.quals[1].testedOn, certify: true });
        h.written.push({ date: h.quals[1].testedOn, kind: 'coupon', code: h.quals[1].code, certified: true });
      }
      // Back-dated use before the qualification: never counts.
      if (rnd() < 0.15) {
        const d = addDays(start, -20 - Math.floor(rnd() * 60));
        await makeUse(ds, { org, shop: shops[1]!, welder, process, usedOn: d });
        h.written.push({ date: d, kind: 'use' });
      }
      const used = new Set<string>();
      let month = addMonths(`${start.slice(0, 7)}-01`, 1);
      while (month < '2025-10-01') {
        const r = rnd();
        if (r < 0.55) {
          const shop = pick(shops);
          const key = `${shop.id}:${month}`;
          if (!used.has(key)) {
            used.add(key);
            const d = addDays(month, Math.floor(rnd() * 28));
            await makeUse(ds, { org, shop, welder, process, usedOn: d });
            h.written.push({ date: d, kind: 'use' });
          }
        } else if (r < 0.6) {
          const d = addDays(month, Math.floor(rnd() * 28));
          // Some coupons pass and are certified (a test of their code), some pass uncertified or under
          // another code (use of the process), some fail (nothing).
          const code = rnd() < 0.7 ? h.quals[0]!.code : pick(codeIds);
          const result = rnd() < 0.85 ? 'accept' : 'reject';
          const certified = result === 'accept' && rnd() < 0.6;
          await makeTest(ds, { org, shop: shops[0]!, welder, procedureId: wps, certifiedBy: qa, code, process, testedOn: d, result, certify: certified });
          if (result === 'accept') h.written.push({ date: d, kind: 'coupon', code, certified });
        }
        // Gaps over six months now and then.
        month = addMonths(month, rnd() < 0.08 ? 7 + Math.floor(rnd() * 6) : 1 + Math.floor(rnd() * 3));
      }
      histories.push(h);
    }
    // The maintained state, through the same per-pair refresh every write path calls.
    const ids = await ds.query<{ id: string; welderId: string; code: string; process: string; revokedOn: string | null }[]>(
      `SELECT id, welder_id AS "welderId", code, process, to_char(revoked_on, 'YYYY-MM-DD') AS "revokedOn" FROM qualifications WHERE organization_id = $1`,
      [org.id],
    );
    for (const q of ids) await refreshContinuityState(ds.manager, q.welderId, q.process, q.code);

    const byWelder = new Map(histories.map((h) => [h.welder.id, h]));
    const key = (s: { welderId: string; process: string; code: string }) => `${s.welderId}:${s.process}:${s.code}`;
    const stored = new Map((await storedStates(ds.manager, { organizationId: org.id })).map((s) => [key(s), s]));
    expect(stored.size).toBe(new Set(ids.map(key)).size);

    const asOfs: string[] = [];
    for (let d = '2019-03-01'; d <= '2026-06-01'; d = addDays(d, 37)) asOfs.push(d);
    let compared = 0;
    let storedCompared = 0;
    for (const asOf of asOfs) {
      const recomputed = new Map((await recomputeAll(ds.manager, { organizationId: org.id, asOf })).map((s) => [key(s), s]));
      for (const q of ids) {
        const h = byWelder.get(q.welderId)!;
        const pair = recomputed.get(key(q))!;
        if (asOf < pair.qualifiedOn) continue;
        const evidence = evidenceFor(h, q.code);
        // The pair is revoked when every qualification of it is (the latest date): from memory: QW-322.1(b).
        const same = ids.filter((o) => o.welderId === q.welderId && o.process === q.process && o.code === q.code);
        const pairRevokedOn = same.every((o) => o.revokedOn) ? same.map((o) => o.revokedOn!).sort().at(-1) : undefined;
        const rules = continuityStatus({ code: q.code as (typeof codeIds)[number], qualifiedOn: pair.qualifiedOn, evidence, asOf, ...(pairRevokedOn ? { revokedOn: pairRevokedOn } : {}) });
        const check = (s: RecomputedState, what: string) => {
          // Pair level: the window walk equals the rules function's, field by field.
          expect({ what, lastEvidence: s.lastEvidence, lastTest: s.lastTest, lapsesOn: s.lapsesOn, ignored: s.ignored, renewedOn: s.renewedOn }).toEqual({
            what,
            lastEvidence: rules.lastEvidence,
            lastTest: rules.lastTest,
            lapsesOn: rules.lapsesOn,
            ignored: rules.ignored,
            renewedOn: rules.renewedOn.at(-1) ?? null,
          });
          // Qualification level: the one status function, with revocation (from memory: QW-322.1(b)).
          const withRevocation = continuityStatus({ code: q.code as (typeof codeIds)[number], qualifiedOn: pair.qualifiedOn, evidence, asOf, ...(q.revokedOn ? { revokedOn: q.revokedOn } : {}) });
          const mine = qualificationStatus({ qualifiedOn: pair.qualifiedOn, revokedOn: q.revokedOn, stateLapsesOn: s.lapsesOn, stateLastEvidence: s.lastEvidence, warnDays: 30 }, asOf);
          expect(mine.state, `${what} ${q.id} ${asOf}`).toBe(withRevocation.state);
          // Once revoked, the rules ignore later evidence of this record, while the pair's other
          // (unrevoked) qualifications still count it: only the state is compared then.
          if (!(q.revokedOn && q.revokedOn <= asOf))
            expect({ lapsesOn: mine.lapsesOn, daysLeft: mine.daysLeft }).toEqual({ lapsesOn: withRevocation.lapsesOn, daysLeft: withRevocation.daysLeft });
        };
        check(pair, 'recompute');
        compared++;
        const latest = h.written.reduce((m, e) => (e.date > m ? e.date : m), '0000');
        if (asOf >= latest) {
          check(stored.get(key(q))!, 'stored');
          storedCompared++;
        }
      }
    }
    expect(compared).toBeGreaterThan(HISTORIES * 20);
    expect(storedCompared).toBeGreaterThan(HISTORIES);
    // The histories really exercise lapses, renewals and ignored use.
    const all = [...stored.values()];
    expect(all.filter((s) => s.renewedOn).length).toBeGreaterThan(5);
    expect(all.filter((s) => s.ignored.length > 0).length).toBeGreaterThan(20);
    expect(new Set(all.map((s) => s.code)).size).toBe(codeIds.length);
  }, 180_000);
});
