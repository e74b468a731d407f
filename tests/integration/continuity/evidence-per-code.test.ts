// Issue 8, the evidence model (DEVELOPERS.md "What counts as evidence"): one test per defect, each of
// which failed on the code before the redesign.
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { addMonths } from '@beadroll/rules';
import { errorOf, signIn, startTestApi, type TestApi } from '../../support/api-app.js';
import { makeWorld, TEST_PASSWORD } from '../../support/factories.js';
import { daysAgo } from '../../support/api-records.js';
import { refreshContinuityPairs, refreshContinuityStates } from '../../../apps/api/src/continuity/continuity-state.repository.js';
import { makeContinuityProcedure, makeTest, makeUse } from './continuity-factories.js';

const thisMonth = () => new Date().toISOString().slice(0, 7);

describe('continuity evidence per code (issue 8)', () => {
  let api: TestApi;
  beforeAll(async () => {
    api = await startTestApi();
  });
  afterAll(() => api.close());

  async function world() {
    const w = await makeWorld(api.ds);
    const wps = await makeContinuityProcedure(api.ds, w.org);
    const qa = await signIn(api.app, w.qa.email, TEST_PASSWORD);
    const foreman = await signIn(api.app, w.foreman.email, TEST_PASSWORD);
    const welder = w.weldersA[0]!;
    const test = (code: string, process: string, testedOn: string, more: { certify?: boolean; revokedOn?: string } = {}) =>
      makeTest(api.ds, { org: w.org, shop: w.shopA, welder, procedureId: wps, certifiedBy: w.qa, code, process, testedOn, ...more });
    const refresh = (process: string) => api.ds.transaction((db) => refreshContinuityStates(db, welder.id, process));
    const pair = async (process: string, code: string) =>
      (
        await api.ds.query<{ lapsesOn: string; lastTest: string; renewedOn: string | null }[]>(
          `SELECT to_char(lapses_on, 'YYYY-MM-DD') AS "lapsesOn", to_char(last_test, 'YYYY-MM-DD') AS "lastTest",
                  to_char(renewed_on, 'YYYY-MM-DD') AS "renewedOn"
             FROM continuity_states WHERE welder_id = $1 AND process = $2 AND code = $3`,
          [welder.id, process, code],
        )
      )[0];
    const entry = async (usedOn: string) =>
      (
        await api.ds.query<{ id: string; flagged: boolean; review: string | null }[]>(
          `SELECT id, flagged_lapsed AS flagged, review_status AS review FROM continuity_entries WHERE welder_id = $1 AND used_on = $2`,
          [welder.id, usedOn],
        )
      )[0];
    return { ...w, wps, qaSession: qa, foremanSession: foreman, welder, test, refresh, pair, entry };
  }

  it('defect 1: an uncertified coupon or one of another code never renews a lapsed pair; it is use of the process for the others', async () => {
    const w = await world();
    // ISO 9606-1 GTAW tested 2024-01-10 and ASME IX GTAW tested 2024-02-01; no use since: both lapsed.
    await w.test('iso-9606-1', 'GTAW', '2024-01-10', { certify: true });
    await w.test('asme-ix', 'GTAW', '2024-02-01', { certify: true });
    await w.refresh('GTAW');
    // from memory: QW-322.1(a): 6 calendar months without use.
    expect(await w.pair('GTAW', 'asme-ix')).toMatchObject({ lapsesOn: '2024-08-01' });
    // A passing ASME IX GTAW coupon, saved but not certified, after both lapses: renews nothing.
    await w.test('asme-ix', 'GTAW', '2025-03-05');
    await w.refresh('GTAW');
    expect(await w.pair('GTAW', 'asme-ix')).toMatchObject({ lapsesOn: '2024-08-01', renewedOn: null });
    // from memory: ISO 9606-1 9.2: six months; the ASME test of 2024-02-01 is use of GTAW for the ISO pair.
    expect(await w.pair('GTAW', 'iso-9606-1')).toMatchObject({ lapsesOn: '2024-08-01', lastTest: '2024-01-10', renewedOn: null });
    // Certified: it renews its own code's pair only (from memory: QW-322.2(a)); ISO stays lapsed.
    await w.test('asme-ix', 'GTAW', '2025-03-20', { certify: true });
    await w.refresh('GTAW');
    expect(await w.pair('GTAW', 'asme-ix')).toMatchObject({ lapsesOn: '2025-09-20', lastTest: '2025-03-20', renewedOn: '2025-03-20' });
    expect(await w.pair('GTAW', 'iso-9606-1')).toMatchObject({ lapsesOn: '2024-08-01', renewedOn: null });
  });

  it('defect 1: a coupon of another code before the lapse keeps the pair in force as use', async () => {
    const w = await world();
    await w.test('asme-ix', 'SMAW', '2025-01-10', { certify: true });
    await w.test('aws-d1.1', 'SMAW', '2025-05-02'); // not certified, another code: use of SMAW on 2025-05-02
    await w.refresh('SMAW');
    // from memory: QW-322.1(a): use extends to six calendar months after it; the test date stays.
    expect(await w.pair('SMAW', 'asme-ix')).toMatchObject({ lapsesOn: '2025-11-02', lastTest: '2025-01-10' });
  });

  it('defect 8: use logged after a revocation is flagged, and a future-dated revocation is the lapse date everywhere', async () => {
    const w = await world();
    const t = new Date();
    const revokeOn = daysAgo(-10); // ten days from now
    const tested = daysAgo(40);
    const { qualificationId } = await w.test('asme-ix', 'SMAW', tested, { certify: true });
    await w.refresh('SMAW');
    await w.qaSession.post(`/api/qualifications/${qualificationId}/revoke`).send({ revokedOn: revokeOn, reason: 'Cracked root on job 3' }).expect(200);
    // from memory: QW-322.1(b): the revocation is the last day in force.
    expect(await w.pair('SMAW', 'asme-ix')).toMatchObject({ lapsesOn: revokeOn });
    const [{ soonest }] = await api.ds.query<[{ soonest: string }]>(`SELECT to_char(soonest_lapses_on, 'YYYY-MM-DD') AS soonest FROM welders WHERE id = $1`, [w.welder.id]);
    expect(soonest).toBe(revokeOn);
    // The grid still offers the cell this month and says when the revocation takes effect.
    const grid = (await w.foremanSession.get('/api/continuity/grid').query({ shopId: w.shopA.id, month: thisMonth() }).expect(200)).body as {
      rows: { welder: { id: string }; qualifiedProcesses: string[]; pairs: { code: string; lapsesOn: string; revokedOn: string | null }[] }[];
    };
    const row = grid.rows.find((r) => r.welder.id === w.welder.id)!;
    expect(row.qualifiedProcesses).toEqual(['SMAW']);
    expect(row.pairs).toEqual([{ process: 'SMAW', code: 'asme-ix', lapsesOn: revokeOn, revokedOn: revokeOn }]);
    // The Overview's lapse chart and the lapse scan read lapses_on: a future revocation shows as the lapse.
    const weeks = await api.ds.query<{ n: number }[]>(
      `SELECT count(*)::int AS n FROM continuity_states WHERE welder_id = $1 AND lapses_on > $2::date AND lapses_on <= $2::date + 30`,
      [w.welder.id, t.toISOString().slice(0, 10)],
    );
    expect(weeks[0]!.n).toBe(1);

    // Use logged on or after a (past) revocation date is flagged for review.
    const w2 = await world();
    const q2 = await w2.test('asme-ix', 'SMAW', daysAgo(100), { certify: true, revokedOn: daysAgo(20) });
    expect(q2.qualificationId).toBeTruthy();
    await makeUse(api.ds, { org: w2.org, shop: w2.shopA, welder: w2.welder, process: 'SMAW', usedOn: daysAgo(30) });
    await makeUse(api.ds, { org: w2.org, shop: w2.shopB, welder: w2.welder, process: 'SMAW', usedOn: daysAgo(20) });
    await w2.refresh('SMAW');
    expect(await w2.entry(daysAgo(30))).toMatchObject({ flagged: false, review: null });
    expect(await w2.entry(daysAgo(20))).toMatchObject({ flagged: true, review: 'pending' });
    expect(await w2.pair('SMAW', 'asme-ix')).toMatchObject({ lapsesOn: daysAgo(20) });
  });

  it('defect 7: a save of a cell someone changed since is refused with 409 naming welder, process and who; nothing saved', async () => {
    const w = await world();
    await w.test('asme-ix', 'SMAW', daysAgo(30), { certify: true });
    await w.refresh('SMAW');
    const month = thisMonth();
    const usedOn = `${month}-01`;
    const cell = { welderId: w.welder.id, process: 'SMAW', usedOn, jobReference: 'J-100' };
    await w.foremanSession.put('/api/continuity/grid').send({ shopId: w.shopA.id, month, cells: [cell] }).expect(200);
    // The QA manager edits version 1 → 2.
    await w.qaSession.put('/api/continuity/grid').send({ shopId: w.shopA.id, month, cells: [{ ...cell, jobReference: 'J-200', version: 1 }] }).expect(200);
    // The foreman, still on version 1, saves over it.
    const stale = await w.foremanSession.put('/api/continuity/grid').send({ shopId: w.shopA.id, month, cells: [{ ...cell, jobReference: 'J-300', version: 1 }] });
    expect(stale.status).toBe(409);
    expect(errorOf(stale).message).toMatch(/A-01 SMAW/);
    expect(Object.keys(errorOf(stale).fields ?? {})).toEqual(['cells.0.version']);
    expect(errorOf(stale).fields?.['cells.0.version']).toMatch(/^A-01 SMAW was changed by Quinn Assay at .*: now job J-200 on /);
    const removeStale = await w.foremanSession.put('/api/continuity/grid').send({ shopId: w.shopA.id, month, remove: [{ welderId: w.welder.id, process: 'SMAW', version: 1 }] });
    expect(removeStale.status).toBe(409);
    const [row] = await api.ds.query<{ job: string; version: number }[]>(`SELECT job_reference AS job, version FROM continuity_entries WHERE welder_id = $1`, [w.welder.id]);
    expect(row).toEqual({ job: 'J-200', version: 2 });
    // Reapplied on the current version, it saves.
    await w.foremanSession.put('/api/continuity/grid').send({ shopId: w.shopA.id, month, cells: [{ ...cell, jobReference: 'J-300', version: 2 }] }).expect(200);
  });

  it('defect 10: an edited or re-flagged reviewed entry waits for review again', async () => {
    const w = await world();
    await w.test('asme-ix', 'SMAW', '2024-01-10', { certify: true });
    await makeUse(api.ds, { org: w.org, shop: w.shopA, welder: w.welder, process: 'SMAW', usedOn: '2024-09-03' });
    await w.refresh('SMAW');
    const e = (await w.entry('2024-09-03'))!;
    expect(e).toMatchObject({ flagged: true, review: 'pending' });
    await w.qaSession.post(`/api/continuity/entries/${e.id}/review`).send({ decision: 'welds-examined', note: 'RT of job J-1 welds' }).expect(200);
    expect(await w.entry('2024-09-03')).toMatchObject({ review: 'reviewed' });
    // A passing certified test before it un-flags it; deleting the test flags it again: a new review.
    const late = await w.test('asme-ix', 'SMAW', '2024-06-01', { certify: true });
    await w.refresh('SMAW');
    expect(await w.entry('2024-09-03')).toMatchObject({ flagged: false, review: null });
    await api.ds.query(`UPDATE qualifications SET revoked_on = '2024-06-01', revoked_reason = 'entered in error' WHERE id = $1`, [late.qualificationId]);
    await api.ds.query(`UPDATE coupons SET result = 'reject' WHERE id = $1`, [late.couponId]);
    await w.refresh('SMAW');
    expect(await w.entry('2024-09-03')).toMatchObject({ flagged: true, review: 'pending' });
    // The earlier decision was about other facts: it is cleared with the review status.
    expect((await api.ds.query<{ d: string | null }[]>(`SELECT review_decision AS d FROM continuity_entries WHERE id = $1`, [e.id]))[0]).toEqual({ d: null });
    await w.qaSession.post(`/api/continuity/entries/${e.id}/review`).send({ decision: 'welds-examined', note: 'RT again' }).expect(200);
    // Edited through the grid (QA may change a closed month): reviewed becomes pending again.
    const [v] = await api.ds.query<{ version: number }[]>(`SELECT version FROM continuity_entries WHERE id = $1`, [e.id]);
    await w.qaSession
      .put('/api/continuity/grid')
      .send({ shopId: w.shopA.id, month: '2024-09', cells: [{ welderId: w.welder.id, process: 'SMAW', usedOn: '2024-09-04', jobReference: 'J-1b', version: v!.version }] })
      .expect(200);
    expect(await w.entry('2024-09-04')).toMatchObject({ flagged: true, review: 'pending' });
  });

  it('defect 10: a 2,000-cell month save fits in one request', async () => {
    const w = await world();
    // 1,000 welders of shop A, each with ASME IX SMAW and GTAW certified 30 days ago (set-based inserts).
    await api.ds.query(
      `WITH ws AS (
         INSERT INTO welders (organization_id, stamp, name, home_shop_id, email, active)
         SELECT $1, 'BIG-' || lpad(g::text, 4, '0'), 'Big Crew ' || g, $2, '', true FROM generate_series(1, 1000) g
         RETURNING id
       ), cs AS (
         INSERT INTO coupons (organization_id, welder_id, shop_id, procedure_id, tested_on, code, process, coupon,
                              examiner, visual, examination, result, rules_version)
         SELECT $1, ws.id, $2, $3, current_date - 30, 'asme-ix', p, '{}', '{"name":"Ivo Testbench"}', 'accept', '{}', 'accept', 'test'
           FROM ws CROSS JOIN unnest('{SMAW,GTAW}'::text[]) p
         RETURNING id, welder_id, process
       )
       INSERT INTO qualifications (organization_id, welder_id, coupon_id, code, process, ranges, certified_on,
                                   certified_by, certified_by_name, rules_version)
       SELECT $1, cs.welder_id, cs.id, 'asme-ix', cs.process, '{}', current_date - 30, $4, 'Test QA', 'test' FROM cs`,
      [w.org.id, w.shopA.id, w.wps, w.qa.id],
    );
    const big = await api.ds.query<{ id: string }[]>(`SELECT id FROM welders WHERE organization_id = $1 AND stamp LIKE 'BIG-%'`, [w.org.id]);
    await api.ds.transaction((db) => refreshContinuityPairs(db, big.flatMap((b) => [{ welderId: b.id, process: 'SMAW' }, { welderId: b.id, process: 'GTAW' }])));
    const month = thisMonth();
    const cells = big.flatMap((b) =>
      ['SMAW', 'GTAW'].map((process) => ({ welderId: b.id, process, usedOn: `${month}-01`, jobReference: 'J-2000-' + 'x'.repeat(60), note: 'Crane girder splice, north bay, second shift' })),
    );
    expect(cells).toHaveLength(2000);
    expect(JSON.stringify(cells).length).toBeGreaterThan(100 * 1024); // over the app-wide limit
    const res = await w.qaSession.put('/api/continuity/grid').send({ shopId: w.shopA.id, month, cells });
    expect(res.status, JSON.stringify(res.body).slice(0, 300)).toBe(200);
    const [{ n }] = await api.ds.query<[{ n: number }]>(`SELECT count(*)::int AS n FROM continuity_entries WHERE organization_id = $1`, [w.org.id]);
    expect(n).toBe(2000);
    // from memory: QW-322.1(a): every pair's lapse moved to six months after the use.
    const [{ m }] = await api.ds.query<[{ m: number }]>(`SELECT count(*)::int AS m FROM continuity_states WHERE organization_id = $1 AND lapses_on = $2::date`, [w.org.id, addMonths(`${month}-01`, 6)]);
    expect(m).toBe(2000);
  });
});
