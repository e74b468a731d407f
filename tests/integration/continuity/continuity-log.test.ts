import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { addMonths, couponRecordSchema, qualificationSchema, welderPageSchema } from '@beadroll/rules';
import { bodyOf, errorOf, signIn, startTestApi, type TestApi } from '../../support/api-app.js';
import { auditRows, makeWorld, TEST_PASSWORD } from '../../support/factories.js';
import { couponBody, daysAgo, makeProcedure } from '../../support/api-records.js';
import { makeContinuityProcedure, makeTest } from './continuity-factories.js';
import { QueryLog } from '../../support/api-query-log.js';

const thisMonth = () => new Date().toISOString().slice(0, 7);
const monthsAgo = (n: number) => addMonths(`${thisMonth()}-01`, -n).slice(0, 7);
const today = () => new Date().toISOString().slice(0, 10);

// Response shapes of the continuity endpoints (contract 5), for typed reads of the bodies.
interface GridCell { entryId: string; usedOn: string; jobReference: string; note: string; flaggedLapsed: boolean; version: number }
interface Grid {
  shop: { id: string };
  month: string;
  closed: boolean;
  processes: string[];
  rows: { welder: { id: string; stamp: string; name: string; homeShopId: string }; home: boolean; qualifiedProcesses: string[]; cells: Record<string, GridCell | null> }[];
}
interface TimelineProcess { process: string; code: string; state: string; lapsesOn: string | null; events: { date: string; kind: string; detail: string }[] }
interface Timeline { processes: TimelineProcess[] }
interface Items<T> { items: T[] }
const typed = <T>(res: { body: unknown }): T => res.body as T;

describe('continuity log (PUT/GET /api/continuity/grid)', () => {
  let api: TestApi;
  beforeAll(async () => {
    api = await startTestApi();
  });
  afterAll(() => api.close());

  /** A world whose welder A-01 holds ASME IX SMAW tested `testedDaysAgo` days ago, B-01 ASME IX GTAW. */
  async function world(testedDaysAgo = 60) {
    const w = await makeWorld(api.ds);
    const wps = await makeContinuityProcedure(api.ds, w.org);
    const qa = await signIn(api.app, w.qa.email, TEST_PASSWORD);
    const foreman = await signIn(api.app, w.foreman.email, TEST_PASSWORD);
    const a1 = w.weldersA[0]!;
    const b1 = w.weldersB[0]!;
    const qA = await makeTest(api.ds, { org: w.org, shop: w.shopA, welder: a1, procedureId: wps, certifiedBy: w.qa, code: 'asme-ix', process: 'SMAW', testedOn: daysAgo(testedDaysAgo), certify: true });
    const qB = await makeTest(api.ds, { org: w.org, shop: w.shopB, welder: b1, procedureId: wps, certifiedBy: w.qa, code: 'asme-ix', process: 'GTAW', testedOn: daysAgo(testedDaysAgo), certify: true });
    // Certifying outside the API: refresh as the certify path does.
    const { refreshContinuityState } = await import('../../../apps/api/src/continuity/continuity-state.repository.js');
    await refreshContinuityState(api.ds.manager, a1.id, 'SMAW', 'asme-ix');
    await refreshContinuityState(api.ds.manager, b1.id, 'GTAW', 'asme-ix');
    return { ...w, qaUser: w.qa, foremanUser: w.foreman, wps, qa, foreman, a1, b1, qA: qA.qualificationId!, qB: qB.qualificationId! };
  }
  const state = async (welderId: string, process: string) =>
    (await api.ds.query<{ lapsesOn: string; lastEvidence: string }[]>(
      `SELECT to_char(lapses_on, 'YYYY-MM-DD') AS "lapsesOn", to_char(last_evidence, 'YYYY-MM-DD') AS "lastEvidence" FROM continuity_states WHERE welder_id = $1 AND process = $2`,
      [welderId, process],
    ))[0];
  const entries = (welderId: string) =>
    api.ds.query<{ id: string; job: string; flagged: boolean; review: string | null; shopId: string }[]>(
      `SELECT id, job_reference AS job, flagged_lapsed AS flagged, review_status AS review, shop_id AS "shopId" FROM continuity_entries WHERE welder_id = $1 ORDER BY used_on`,
      [welderId],
    );

  it('shows the home crew first, saves a month, and a second save updates the cell instead of adding one', async () => {
    const w = await world();
    const month = thisMonth();
    const grid = typed<Grid>(await w.foreman.get('/api/continuity/grid').query({ shopId: w.shopA.id, month }).expect(200));
    expect(grid).toMatchObject({ shop: { id: w.shopA.id }, month, closed: false, processes: ['SMAW'] });
    expect(grid.rows.map((r) => r.welder.stamp)).toEqual(['A-01', 'A-02']);
    expect(grid.rows[0]!.cells.SMAW).toBeNull();
    const usedOn = `${month}-01`;
    const saved = typed<Grid>(await w.foreman.put('/api/continuity/grid').send({ shopId: w.shopA.id, month, cells: [{ welderId: w.a1.id, process: 'SMAW', usedOn, jobReference: 'J-4411' }] }).expect(200));
    expect(saved.rows[0]!.cells.SMAW).toMatchObject({ usedOn, jobReference: 'J-4411', flaggedLapsed: false, version: 1 });
    // from memory: QW-322.1(a): use extends the window to six calendar months after it.
    expect(await state(w.a1.id, 'SMAW')).toEqual({ lastEvidence: usedOn, lapsesOn: addMonths(usedOn, 6) });
    await w.foreman.put('/api/continuity/grid').send({ shopId: w.shopA.id, month, cells: [{ welderId: w.a1.id, process: 'SMAW', usedOn, jobReference: 'J-4412', note: 'crane rails', version: 1 }] }).expect(200);
    const rows = await entries(w.a1.id);
    expect(rows).toHaveLength(1);
    expect(rows[0]!.job).toBe('J-4412');
    const audit = await auditRows(api.ds, rows[0]!.id);
    expect(audit.map((a) => a.action)).toEqual(['continuity-entry.created', 'continuity-entry.updated']);
    expect(audit[1]).toMatchObject({ entityType: 'continuity-entry', before: { jobReference: 'J-4411' }, after: { jobReference: 'J-4412', note: 'crane rails' } });
    // Removing the cell restores the state to the test alone, audited.
    await w.foreman.put('/api/continuity/grid').send({ shopId: w.shopA.id, month, remove: [{ welderId: w.a1.id, process: 'SMAW', version: 2 }] }).expect(200);
    expect(await entries(w.a1.id)).toHaveLength(0);
    expect((await state(w.a1.id, 'SMAW'))!.lastEvidence).toBe(daysAgo(60));
    expect((await auditRows(api.ds, rows[0]!.id)).map((a) => a.action).at(-1)).toBe('continuity-entry.removed');
  });

  it('two saves of the same empty cell at the same moment: one is saved, the other is told who won (409)', async () => {
    const w = await world();
    const month = thisMonth();
    const body = (job: string) => ({ shopId: w.shopA.id, month, cells: [{ welderId: w.a1.id, process: 'SMAW', usedOn: `${month}-01`, jobReference: job }] });
    const [r1, r2] = await Promise.all([w.foreman.put('/api/continuity/grid').send(body('J-1')), w.qa.put('/api/continuity/grid').send(body('J-2'))]);
    expect([r1.status, r2.status].sort()).toEqual([200, 409]);
    const rows = await entries(w.a1.id);
    expect(rows).toHaveLength(1);
    const lost = r1.status === 409 ? r1 : r2;
    expect(errorOf(lost).fields?.['cells.0.version']).toMatch(new RegExp(`^A-01 SMAW was changed by .* now job ${rows[0]!.job}`));
  });

  it('counts use logged in another shop: continuity is per welder and process across the company', async () => {
    const w = await world();
    const month = thisMonth();
    // QA logs B-01 (home shop B) in shop A, where B-01 is added by stamp.
    const found = typed<Items<{ stamp: string }>>(await w.qa.get('/api/continuity/welders').query({ shopId: w.shopA.id, q: 'B-01' }).expect(200));
    expect(found.items.map((x) => x.stamp)).toEqual(['B-01']);
    const grid = typed<Grid>(await w.qa.put('/api/continuity/grid').send({ shopId: w.shopA.id, month, cells: [{ welderId: w.b1.id, process: 'GTAW', usedOn: `${month}-01`, jobReference: 'J-77' }] }).expect(200));
    expect(grid.rows.at(-1)).toMatchObject({ welder: { stamp: 'B-01' }, home: false });
    expect(grid.processes).toEqual(['SMAW', 'GTAW']);
    expect((await state(w.b1.id, 'GTAW'))!.lastEvidence).toBe(`${month}-01`);
  });

  it('flags use logged while lapsed; the status stays lapsed; the QA manager reviews it', async () => {
    const w = await world(400); // tested 400 days ago, no use since: lapsed (from memory: QW-322.1(a)).
    const month = thisMonth();
    await w.foreman.put('/api/continuity/grid').send({ shopId: w.shopA.id, month, cells: [{ welderId: w.a1.id, process: 'SMAW', usedOn: `${month}-01`, jobReference: 'J-9' }] }).expect(200);
    const [e] = await entries(w.a1.id);
    expect(e).toMatchObject({ flagged: true, review: 'pending' });
    const q = bodyOf(qualificationSchema, await w.qa.get(`/api/qualifications/${w.qA}`).expect(200));
    expect(q.status).toMatchObject({ state: 'lapsed', lapsesOn: addMonths(daysAgo(400), 6) });
    const queue = typed<Items<{ id: string }>>(await w.qa.get('/api/continuity/review').expect(200));
    expect(queue.items).toHaveLength(1);
    expect((await w.foreman.get('/api/continuity/review')).status).toBe(403);
    // A review needs a decision about the welds and a note (issue 10, item 2); nothing is saved without them.
    const noDecision = await w.qa.post(`/api/continuity/entries/${e!.id}/review`).send({ note: 'Welds on J-9 to be radiographed' });
    expect(noDecision.status).toBe(400);
    expect(errorOf(noDecision).fields).toMatchObject({ decision: 'Choose what was decided about the welds' });
    const noNote = await w.qa.post(`/api/continuity/entries/${e!.id}/review`).send({ decision: 'welds-examined', note: '   ' });
    expect(noNote.status).toBe(400);
    expect(errorOf(noNote).fields).toHaveProperty('note');
    expect(typed<Items<{ id: string }>>(await w.qa.get('/api/continuity/review').expect(200)).items).toHaveLength(1);
    await w.qa.post(`/api/continuity/entries/${e!.id}/review`).send({ decision: 'welds-examined', note: 'Welds on J-9 radiographed, RT-118 accepted' }).expect(200);
    expect((await api.ds.query<{ d: string; n: string }[]>(`SELECT review_decision AS d, review_note AS n FROM continuity_entries WHERE id = $1`, [e!.id]))[0]).toEqual({ d: 'welds-examined', n: 'Welds on J-9 radiographed, RT-118 accepted' });
    expect(typed<Items<{ id: string }>>(await w.qa.get('/api/continuity/review').expect(200)).items).toHaveLength(0);
    expect((await auditRows(api.ds, e!.id)).map((a) => a.action)).toContain('continuity-entry.reviewed');
    const timeline = typed<Timeline>(await w.qa.get(`/api/welders/${w.a1.id}/timeline`).expect(200));
    const smaw = timeline.processes.find((p) => p.process === 'SMAW');
    expect(smaw?.state).toBe('lapsed');
    expect(smaw?.events.map((x) => x.kind)).toEqual(['test', 'lapse', 'use', 'flag']);
  });

  it('a passing coupon renews its own code only once certified, never the revoked one; the timeline shows it', async () => {
    const w = await world(400);
    // A second, revoked SMAW qualification (other code) of the same welder.
    const revoked = await makeTest(api.ds, { org: w.org, shop: w.shopA, welder: w.a1, procedureId: w.wps, certifiedBy: w.qaUser, code: 'aws-d1.1', process: 'SMAW', testedOn: daysAgo(390), certify: true });
    await w.qa.post(`/api/qualifications/${revoked.qualificationId}/revoke`).send({ revokedOn: daysAgo(300), reason: 'Failed RT on job 12' }).expect(200);
    const wps = await makeProcedure(api.ds, w.org, { number: 'R-1' });
    const c = bodyOf(couponRecordSchema, await w.qa.post('/api/coupons').send(couponBody({ welderId: w.a1.id, shopId: w.shopA.id, procedureId: wps.id }, { testedOn: daysAgo(5) })).expect(201));
    expect(c.result).toBe('accept');
    // Saved but not certified: at most use, and use after the lapse revives nothing (TRADE.md §9).
    expect(bodyOf(qualificationSchema, await w.qa.get(`/api/qualifications/${w.qA}`).expect(200)).status.state).toBe('lapsed');
    await w.qa.post(`/api/coupons/${c.id}/certify`).send({ certifiedOn: today(), version: c.version }).expect(201);
    const q = bodyOf(qualificationSchema, await w.qa.get(`/api/qualifications/${w.qA}`).expect(200));
    // from memory: QW-322.2(a): a passing test after the lapse renews; ranges unchanged.
    expect(q.status).toMatchObject({ state: 'current', lapsesOn: addMonths(daysAgo(5), 6), lastEvidence: daysAgo(5) });
    expect(bodyOf(qualificationSchema, await w.qa.get(`/api/qualifications/${revoked.qualificationId}`).expect(200)).status.state).toBe('revoked');
    const [s] = await api.ds.query<{ renewedOn: string }[]>(`SELECT to_char(renewed_on, 'YYYY-MM-DD') AS "renewedOn" FROM continuity_states WHERE welder_id = $1 AND code = 'asme-ix'`, [w.a1.id]);
    expect(s!.renewedOn).toBe(daysAgo(5));
    const tl = typed<Timeline>(await w.qa.get(`/api/welders/${w.a1.id}/timeline`).expect(200));
    const asme = tl.processes.find((p) => p.code === 'asme-ix');
    // The revoked AWS record's coupon is SMAW use for the ASME pair, not an ASME test.
    expect(asme?.events.map((x) => x.kind)).toEqual(['test', 'use', 'lapse', 'test', 'renewal']);
    const aws = tl.processes.find((p) => p.code === 'aws-d1.1');
    expect(aws?.state).toBe('revoked');
    expect(aws?.events.map((x) => x.kind)).toContain('revocation');
  });

  it('refuses: welder role 403, foreman of another shop 403, closed month for the foreman 403 (QA may), bad input 400 with nothing saved', async () => {
    const w = await world();
    const welder = await signIn(api.app, w.welder.email, TEST_PASSWORD);
    const cell = (over: Record<string, unknown> = {}) => ({ welderId: w.a1.id, process: 'SMAW', usedOn: `${thisMonth()}-01`, jobReference: 'J-1', ...over });
    expect((await welder.put('/api/continuity/grid').send({ shopId: w.shopA.id, month: thisMonth(), cells: [cell()] })).status).toBe(403);
    expect((await welder.get('/api/continuity/grid').query({ shopId: w.shopA.id, month: thisMonth() })).status).toBe(403);
    expect((await w.foreman.put('/api/continuity/grid').send({ shopId: w.shopB.id, month: thisMonth(), cells: [] })).status).toBe(403);
    expect((await w.foreman.get('/api/continuity/grid').query({ shopId: w.shopB.id, month: thisMonth() })).status).toBe(403);
    const bad = async (body: Record<string, unknown>, field: string) => {
      const res = await w.qa.put('/api/continuity/grid').send({ shopId: w.shopA.id, month: thisMonth(), ...body });
      expect(res.status, JSON.stringify(res.body)).toBe(400);
      expect(Object.keys(errorOf(res).fields ?? {})).toContain(field);
    };
    await bad({ month: '2025-13' }, 'month');
    await bad({ month: 'May 2025' }, 'month');
    await bad({ cells: [cell({ process: 'XYZ' })] }, 'cells.0.process');
    await bad({ cells: [cell({ jobReference: '  ' })] }, 'cells.0.jobReference');
    await bad({ cells: [cell({ usedOn: `${monthsAgo(1)}-03` })] }, 'cells.0.usedOn');
    await bad({ cells: [cell({ process: 'GTAW' })] }, 'cells.0.process'); // A-01 holds no GTAW qualification
    const tomorrow = new Date(Date.now() + 86_400_000).toISOString().slice(0, 10);
    if (tomorrow.slice(0, 7) === thisMonth()) await bad({ cells: [cell({ usedOn: tomorrow })] }, 'cells.0.usedOn');
    await bad({ month: addMonths(`${thisMonth()}-01`, 1).slice(0, 7), cells: [] }, 'month');
    expect(await entries(w.a1.id)).toHaveLength(0);
    const closed = monthsAgo(3);
    const closedCell = cell({ usedOn: `${closed}-02` });
    const res = await w.foreman.put('/api/continuity/grid').send({ shopId: w.shopA.id, month: closed, cells: [closedCell] });
    expect(res.status).toBe(403);
    expect(errorOf(res).message).toMatch(/closed/);
    expect(typed<Grid>(await w.foreman.get('/api/continuity/grid').query({ shopId: w.shopA.id, month: closed }).expect(200)).closed).toBe(true);
    await w.qa.put('/api/continuity/grid').send({ shopId: w.shopA.id, month: closed, cells: [closedCell] }).expect(200);
    expect(await entries(w.a1.id)).toHaveLength(1);
  });

  it('welders list: status per qualification, state filter and soonest-lapse sort in one page query and one count', async () => {
    const w = await world(170); // lapses in about 10 days (from memory: QW-322.1(a)): lapsing
    const log = new QueryLog();
    const logged = await startTestApi({ dataSourceOptions: { logging: ['query'], logger: log } });
    const qaLogged = await signIn(logged.app, (await api.ds.query<{ email: string }[]>(`SELECT email FROM users WHERE id = $1`, [w.qaUser.id]))[0]!.email, TEST_PASSWORD);
    const list = async (query: Record<string, string>) => {
      log.clear();
      const page = bodyOf(welderPageSchema, await qaLogged.get('/api/welders').query(query).expect(200));
      return { page, queries: [...log.queries] };
    };
    const lapsing = await list({ state: 'lapsing' });
    expect(lapsing.page.items.map((x) => x.stamp).sort()).toEqual(['A-01', 'B-01']);
    expect(lapsing.page.items[0]!.qualifications![0]).toMatchObject({ state: 'lapsing', lapsesOn: addMonths(daysAgo(170), 6) });
    await w.qa.put('/api/continuity/grid').send({ shopId: w.shopA.id, month: thisMonth(), cells: [{ welderId: w.a1.id, process: 'SMAW', usedOn: today(), jobReference: 'J-3' }] }).expect(200);
    const sorted = await list({ sort: 'lapsesOn' });
    expect(sorted.page.items.map((x) => x.stamp)).toEqual(['B-01', 'A-01', 'A-02', 'B-02']);
    expect(sorted.page.items[1]!.qualifications![0]!.state).toBe('current');
    // One page query and one count, whatever the number of welders (plus the settings read).
    const welderReads = sorted.queries.filter((q) => q.includes('FROM "welders" "w"'));
    expect(welderReads.length, welderReads.join('\n---\n')).toBeLessThanOrEqual(2);
    const current = await list({ state: 'current', shopId: w.shopA.id });
    expect(current.page.items.map((x) => x.stamp)).toEqual(['A-01']);
    await logged.close();
  });
});
