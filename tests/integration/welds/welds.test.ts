import { execFileSync } from 'node:child_process';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { addMonths, weldDetailSchema, weldPageSchema, weldSchema, type Weld } from '@beadroll/rules';
import { bodyOf, errorOf, signIn, startTestApi, type TestApi } from '../../support/api-app.js';
import { auditRows, makeOtherCompany, makeWorld, TEST_PASSWORD } from '../../support/factories.js';
import { daysAgo } from '../../support/api-records.js';
import { makeContinuityProcedure, makeUse } from '../continuity/continuity-factories.js';
import { certify, weldBody } from './weld-factories.js';

const today = () => new Date().toISOString().slice(0, 10);
const monthsAgo = (n: number) => addMonths(today(), -n);

describe('production welds (/api/welds)', () => {
  let api: TestApi;
  beforeAll(async () => {
    api = await startTestApi();
  });
  afterAll(() => api.close());

  /** A company whose welder A-01 (home shop A) holds PLATE_3G tested `testedMonthsAgo` months ago. */
  async function world(testedMonthsAgo = 2, revokedOn?: string) {
    const w = await makeWorld(api.ds);
    const wps = await makeContinuityProcedure(api.ds, w.org);
    const a1 = w.weldersA[0]!;
    const testedOn = monthsAgo(testedMonthsAgo);
    const qualificationId = await certify(api.ds, { org: w.org, shop: w.shopA, welder: a1, procedureId: wps, by: w.qa, testedOn, ...(revokedOn ? { revokedOn } : {}) });
    const qa = await signIn(api.app, w.qa.email, TEST_PASSWORD);
    const foreman = await signIn(api.app, w.foreman.email, TEST_PASSWORD);
    return { ...w, wps, a1, testedOn, qualificationId, qaAgent: qa, foremanAgent: foreman };
  }
  type World = Awaited<ReturnType<typeof world>>;
  const log = async (w: World, over: Parameters<typeof weldBody>[1] = {}) =>
    bodyOf(weldSchema, await w.foremanAgent.post('/api/welds').send(weldBody({ shopId: w.shopA.id, welderId: w.a1.id }, over)).expect(201));
  const stateOf = async (welderId: string) =>
    (await api.ds.query<{ lastEvidence: string; lapsesOn: string }[]>(
      `SELECT to_char(last_evidence, 'YYYY-MM-DD') AS "lastEvidence", to_char(lapses_on, 'YYYY-MM-DD') AS "lapsesOn"
         FROM continuity_states WHERE welder_id = $1 AND process = 'SMAW'`,
      [welderId],
    ))[0]!;

  describe('POST /api/welds', () => {
    it('logs a weld inside the qualification, stores the check with the rules version, audits it, and counts it as use', async () => {
      const w = await world(2);
      const weld = await log(w, { weldNumber: '14' });
      expect(weld).toMatchObject({ jobReference: 'HPF-2433', weldNumber: '14', flagged: false, reviewStatus: null });
      expect(weld.rulesVersion).toMatch(/^\d+\.\d+\.\d+$/);
      expect(weld.passes).toEqual([
        expect.objectContaining({ process: 'SMAW', layer: 'all', qualified: true, qualificationId: w.qualificationId, reasons: [], countedForContinuity: true }),
      ]);
      // From memory: QW-322.1(a) — six months from the last documented use.
      expect(await stateOf(w.a1.id)).toEqual({ lastEvidence: today(), lapsesOn: addMonths(today(), 6) });
      const audit = await auditRows(api.ds, weld.id);
      expect(audit).toEqual([expect.objectContaining({ action: 'weld.created', entityType: 'weld', actorId: w.foreman.id })]);
    });

    // Each variable outside PLATE_3G's ranges, with the clause it comes from (from memory: ASME IX).
    it.each([
      ['position', { position: 'O' }, 'QW-461.9'],
      ['thickness', { thickness: { value: 1, unit: 'in' } }, 'QW-452.1'],
      ['diameter', { form: 'pipe', position: 'F', outsideDiameter: { value: 2.375, unit: 'in' } }, 'QW-452.3'],
      ['fNumber', { fNumber: 5 }, 'QW-433'],
      ['backing', { backing: false }, 'QW-402.4'],
      ['progression', { progression: 'downhill' }, 'QW-405.3'],
    ] as const)('flags a weld out of range on %s (from memory: %s) and keeps it', async (variable, joint, clause) => {
      const w = await world(2);
      const weld = await log(w, { joint });
      expect(weld.flagged).toBe(true);
      expect(weld.reviewStatus).toBe('pending');
      const reasons = weld.passes[0]!.reasons;
      expect(reasons.map((r) => r.variable)).toContain(variable);
      expect(reasons.find((r) => r.variable === variable)!.clause).toContain(clause);
      // Flagged, never refused: the weld exists and waits in the review queue.
      const queue = bodyOf(weldPageSchema, await w.qaAgent.get('/api/welds').query({ flagged: 'pending' }).expect(200));
      expect(queue.items.map((x) => x.id)).toContain(weld.id);
    });

    it('flags a weld made by a lapsed welder and does not count it as use (from memory: QW-322.1(a))', async () => {
      const w = await world(8);
      const before = await stateOf(w.a1.id);
      expect(before.lapsesOn).toBe(addMonths(w.testedOn, 6));
      const weld = await log(w);
      expect(weld.flagged).toBe(true);
      expect(weld.passes[0]!.reasons.map((r) => r.variable)).toContain('lapsed');
      expect(weld.passes[0]!.countedForContinuity).toBe(false);
      expect(await stateOf(w.a1.id)).toMatchObject({ lapsesOn: before.lapsesOn, lastEvidence: w.testedOn });
    });

    it('a weld after the lapse revives nothing: the next weld is flagged too (use after lapse, from memory: QW-322.2(a))', async () => {
      const w = await world(8);
      await log(w, { weldNumber: '1', weldedOn: daysAgo(20) });
      const second = await log(w, { weldNumber: '2', weldedOn: daysAgo(5) });
      expect(second.flagged).toBe(true);
      expect(second.passes[0]!.reasons.map((r) => r.variable)).toContain('lapsed');
      expect(second.passes[0]!.countedForContinuity).toBe(false);
    });

    it('flags a weld made on or after the revocation (from memory: QW-322.1(b))', async () => {
      const w = await world(3, daysAgo(10));
      const weld = await log(w, { weldedOn: daysAgo(2) });
      expect(weld.flagged).toBe(true);
      expect(weld.passes[0]!.reasons.map((r) => r.variable)).toContain('revoked');
      // Before the revocation the same welder was qualified.
      const earlier = await log(w, { weldedOn: daysAgo(20) });
      expect(earlier.flagged).toBe(false);
    });

    it('checks root and fill welders separately: only the unqualified one carries reasons', async () => {
      const w = await world(2);
      const other = w.weldersA[1]!; // holds no qualification
      const weld = await log(w, {
        passes: [
          { welderId: w.a1.id, process: 'SMAW', layer: 'root' },
          { welderId: other.id, process: 'SMAW', layer: 'fill' },
        ],
      });
      expect(weld.flagged).toBe(true);
      expect(weld.passes.map((p) => [p.welder.stamp, p.layer, p.qualified])).toEqual([
        ['A-01', 'root', true],
        ['A-02', 'fill', false],
      ]);
      expect(weld.passes[0]!.reasons).toEqual([]);
      expect(weld.passes[1]!.reasons.length).toBeGreaterThan(0);
    });

    it('reads a pipe given as NPS and schedule (published: ASME B36.10M, NPS 6 = 6.625 in OD)', async () => {
      const w = await world(2);
      const weld = await log(w, { joint: { form: 'pipe', position: 'F', nps: '6', schedule: '80' } as never });
      expect(weld.joint).toMatchObject({ outsideDiameter: { value: 6.625, unit: 'in' } });
      expect(weld.flagged).toBe(false);
    });

    it('refuses bad input with the field named and saves nothing', async () => {
      const w = await world(2);
      const bad = await w.foremanAgent
        .post('/api/welds')
        .send({ ...weldBody({ shopId: w.shopA.id, welderId: w.a1.id }), joint: { form: 'pipe', weld: 'groove', position: 'F', thickness: { value: 0.5, unit: 'in' }, backing: true } })
        .expect(400);
      expect(errorOf(bad).fields).toHaveProperty(['joint.outsideDiameter']);
      const dup = weldBody({ shopId: w.shopA.id, welderId: w.a1.id }, { weldNumber: '7' });
      await w.foremanAgent.post('/api/welds').send(dup).expect(201);
      const again = await w.foremanAgent.post('/api/welds').send(dup).expect(400);
      expect(errorOf(again).fields).toEqual({ weldNumber: 'Weld 7 is already logged on job HPF-2433' });
      const future = await w.foremanAgent.post('/api/welds').send(weldBody({ shopId: w.shopA.id, welderId: w.a1.id }, { weldedOn: '2999-01-01' })).expect(400);
      expect(errorOf(future).fields).toHaveProperty('weldedOn');
      const [n] = await api.ds.query<{ n: number }[]>(`SELECT count(*)::int AS n FROM welds WHERE organization_id = $1`, [w.org.id]);
      expect(n!.n).toBe(1);
    });

    it('keeps a foreman to the shops they are assigned to, and another company out', async () => {
      const w = await world(2);
      const res = await w.foremanAgent.post('/api/welds').send(weldBody({ shopId: w.shopB.id, welderId: w.a1.id })).expect(403);
      expect(errorOf(res).message).toMatch(/shops you are assigned to/);
      const other = await makeOtherCompany(api.ds);
      const cross = await w.qaAgent.post('/api/welds').send(weldBody({ shopId: w.shopA.id, welderId: other.welder.id })).expect(400);
      expect(errorOf(cross).fields).toHaveProperty(['passes.0.welderId']);
    });
  });

  describe('GET /api/welds and /api/welds/:id', () => {
    it('filters by job, welder, shop, dates and flag, scoped to the foreman’s shops', async () => {
      const w = await world(2);
      const a = await log(w, { jobReference: 'JOB-A', weldNumber: '1', weldedOn: daysAgo(3) });
      const b = await log(w, { jobReference: 'JOB-A', weldNumber: '2', weldedOn: daysAgo(1), joint: { position: 'O' } });
      const inB = bodyOf(weldSchema, await w.qaAgent.post('/api/welds').send(weldBody({ shopId: w.shopB.id, welderId: w.a1.id }, { jobReference: 'JOB-B' })).expect(201));
      const ids = async (agent: typeof w.qaAgent, q: Record<string, string>) =>
        bodyOf(weldPageSchema, await agent.get('/api/welds').query(q).expect(200)).items.map((x: Weld) => x.id);
      expect(await ids(w.qaAgent, { job: 'JOB-A' })).toEqual([a.id, b.id]);
      expect(await ids(w.qaAgent, { welderId: w.a1.id })).toEqual(expect.arrayContaining([a.id, b.id, inB.id]));
      expect(await ids(w.qaAgent, { shopId: w.shopB.id })).toEqual([inB.id]);
      expect(await ids(w.qaAgent, { job: 'JOB-A', from: daysAgo(2), to: today() })).toEqual([b.id]);
      expect(await ids(w.qaAgent, { job: 'JOB-A', flagged: 'true' })).toEqual([b.id]);
      expect(await ids(w.qaAgent, { job: 'JOB-A', flagged: 'false' })).toEqual([a.id]);
      // The foreman of shop A sees shop A's welds only.
      expect(await ids(w.foremanAgent, {})).toEqual([a.id, b.id]);
      await w.foremanAgent.get(`/api/welds/${inB.id}`).expect(404);
      const other = await makeOtherCompany(api.ds);
      const otherQa = await signIn(api.app, other.qa.email, TEST_PASSWORD);
      await otherQa.get(`/api/welds/${a.id}`).expect(404);
      const bad = await w.qaAgent.get('/api/welds').query({ from: 'yesterday' }).expect(400);
      expect(errorOf(bad).fields).toHaveProperty('from');
    });

    it('answers one weld with its check and the proof of each welder', async () => {
      const w = await world(2);
      const weld = await log(w);
      const detail = bodyOf(weldDetailSchema, await w.foremanAgent.get(`/api/welds/${weld.id}`).expect(200));
      expect(detail.passes[0]).toMatchObject({ qualified: true, qualificationId: w.qualificationId });
      expect(detail.proof).toHaveLength(1);
      expect(detail.proof[0]).toMatchObject({ passId: weld.passes[0]!.id, answer: { qualified: true, qualificationId: w.qualificationId } });
    });

    it("names an earlier production weld in a later weld's proof chain: job, weld number, shop and who logged it", async () => {
      const w = await world(3);
      const earlier = await log(w, { weldNumber: '7', jobReference: 'TRV-131', weldedOn: monthsAgo(1) });
      const later = await log(w, { weldNumber: '14' });
      const detail = bodyOf(weldDetailSchema, await w.qaAgent.get(`/api/welds/${later.id}`).expect(200));
      const chain = detail.proof[0]!.answer.evidence.qualifications[0]!.continuity.evidence;
      // The walk carries a weld pass id for a production weld's day; the proof must say which weld it was.
      const row = chain.find((e) => e.date === monthsAgo(1))!;
      expect(row).toMatchObject({
        kind: 'use',
        source: 'weld-log',
        counted: true,
        job: 'TRV-131',
        weldNumber: '7',
        weldId: earlier.id,
        shop: w.shopA.name,
        loggedBy: w.foreman.name,
      });
      expect(chain.every((e) => e.source !== 'other')).toBe(true);
    });
  });

  describe('POST /api/welds/:id/disposition', () => {
    it('lets the QA manager disposition a flagged weld once, audited; the foreman may not', async () => {
      const w = await world(2);
      const weld = await log(w, { joint: { position: 'O' } });
      await w.foremanAgent.post(`/api/welds/${weld.id}/disposition`).send({ decision: 'cut-out', reason: 'x' }).expect(403);
      const missing = await w.qaAgent.post(`/api/welds/${weld.id}/disposition`).send({ decision: 'cut-out' }).expect(400);
      expect(errorOf(missing).fields).toHaveProperty('reason');
      const done = bodyOf(weldSchema, await w.qaAgent.post(`/api/welds/${weld.id}/disposition`).send({ decision: 'cut-out', reason: 'Cut out and rewelded by A-02' }).expect(200));
      expect(done).toMatchObject({ reviewStatus: 'dispositioned', disposition: { decision: 'cut-out', reason: 'Cut out and rewelded by A-02', by: 'Quinn Assay' } });
      await w.qaAgent.post(`/api/welds/${weld.id}/disposition`).send({ decision: 'accepted', reason: 'again' }).expect(409);
      const audit = await auditRows(api.ds, weld.id);
      expect(audit.map((a) => a.action)).toEqual(['weld.created', 'weld.dispositioned']);
      const clean = await log(w);
      await w.qaAgent.post(`/api/welds/${clean.id}/disposition`).send({ decision: 'accepted', reason: 'fine' }).expect(409);
      const queue = bodyOf(weldPageSchema, await w.qaAgent.get('/api/welds').query({ flagged: 'pending' }).expect(200));
      expect(queue.items.map((x) => x.id)).not.toContain(weld.id);
    });
  });

  describe('re-checking', () => {
    it('flags the welds made on or after a back-dated revocation and puts them in the review queue (from memory: QW-322.1(b))', async () => {
      const w = await world(3);
      const before = await log(w, { weldNumber: '1', weldedOn: daysAgo(30) });
      const after = await log(w, { weldNumber: '2', weldedOn: daysAgo(5) });
      expect([before.flagged, after.flagged]).toEqual([false, false]);
      await w.qaAgent.post(`/api/qualifications/${w.qualificationId}/revoke`).send({ revokedOn: daysAgo(10), reason: 'Rejected radiographs on job HPF-2433' }).expect(200);
      const read = async (id: string) => bodyOf(weldDetailSchema, await w.qaAgent.get(`/api/welds/${id}`).expect(200));
      expect((await read(before.id)).flagged).toBe(false);
      const now = await read(after.id);
      expect(now).toMatchObject({ flagged: true, reviewStatus: 'pending' });
      expect(now.passes[0]!.reasons.map((r) => r.variable)).toContain('revoked');
      expect((await auditRows(api.ds, after.id)).map((a) => a.action)).toEqual(['weld.created', 'weld.flagged-on-recheck']);
    });

    it('flags the welds a deleted continuity entry had kept in force', async () => {
      const w = await world(8);
      const usedOn = monthsAgo(4);
      await makeUse(api.ds, { org: w.org, shop: w.shopA, welder: w.a1, process: 'SMAW', usedOn });
      const { refreshContinuityState } = await import('../../../apps/api/src/continuity/continuity-state.repository.js');
      await refreshContinuityState(api.ds.manager, w.a1.id, 'SMAW', 'asme-ix');
      const weld = await log(w, { weldedOn: daysAgo(1) });
      expect(weld.flagged).toBe(false);
      const [entry] = await api.ds.query<{ version: number }[]>(`SELECT version FROM continuity_entries WHERE welder_id = $1`, [w.a1.id]);
      await w.qaAgent
        .put('/api/continuity/grid')
        .send({ shopId: w.shopA.id, month: usedOn.slice(0, 7), remove: [{ welderId: w.a1.id, process: 'SMAW', version: entry!.version }] })
        .expect(200);
      const now = bodyOf(weldDetailSchema, await w.qaAgent.get(`/api/welds/${weld.id}`).expect(200));
      expect(now).toMatchObject({ flagged: true, reviewStatus: 'pending' });
      expect(now.passes[0]!.reasons.map((r) => r.variable)).toContain('lapsed');
    });
  });

  describe('the weld page and the job summary', () => {
    const binary = (res: { body: unknown }) => res.body as Buffer;
    const pdfText = (pdf: Buffer) => execFileSync('pdftotext', ['-layout', '-', '-'], { input: pdf }).toString('utf8');
    const asBuffer = (agent: World['qaAgent'], url: string) =>
      agent.get(url).buffer(true).parse((res, cb) => {
        const chunks: Buffer[] = [];
        res.on('data', (c: Buffer) => chunks.push(c));
        res.on('end', () => cb(null, Buffer.concat(chunks)));
      });

    it('prints the weld page: who made it, whether qualified that day with the clause, the proof, and who decides', async () => {
      const w = await world(2);
      const weld = await log(w, { weldNumber: '14', joint: { position: 'O' } });
      const res = await asBuffer(w.foremanAgent, `/api/welds/${weld.id}/pdf`).expect(200).expect('Content-Type', 'application/pdf');
      const text = pdfText(binary(res));
      expect(text).toContain('Production weld record');
      expect(text).toContain('HPF-2433');
      expect(text).toMatch(/A-01 Ada Quenby/);
      expect(text).toMatch(/Not qualified for this joint/);
      expect(text).toContain('QW-461.9');
      expect(text).toMatch(/Who decides/);
      expect(text).toMatch(/responsible inspector/);
    });

    it('gives the job summary as CSV (formula-looking cells kept as text) and PDF, scoped like the welds', async () => {
      const w = await world(2);
      await log(w, { jobReference: 'JOB-SUM', weldNumber: '=1+2', weldedOn: daysAgo(2) });
      await log(w, { jobReference: 'JOB-SUM', weldNumber: '2', joint: { fNumber: 5 } });
      const csv = (await asBuffer(w.qaAgent, '/api/welds/job-summary.csv?job=JOB-SUM').expect(200).expect('Content-Type', /text\/csv/)).body as Buffer;
      const lines = csv.toString('utf8').trim().split('\r\n');
      expect(lines[0]).toMatch(/^Job,Weld,Date welded/);
      expect(lines).toHaveLength(3);
      // common practice (no source): a cell starting with = + - @ is prefixed so a spreadsheet reads it as text.
      expect(lines.find((l) => l.includes("'=1+2"))).toMatch(/^JOB-SUM,"'=1\+2",/);
      expect(lines.find((l) => l.startsWith('JOB-SUM,2,'))).toMatch(/,no,.*F-No\. 5.*QW-433/);
      const pdf = pdfText(binary(await asBuffer(w.qaAgent, '/api/welds/job-summary.pdf?job=JOB-SUM').expect(200)));
      expect(pdf).toContain('Job JOB-SUM');
      expect(pdf).toMatch(/2 welds · 1 flagged/);
      await w.qaAgent.get('/api/welds/job-summary.pdf?job=NO-SUCH-JOB').expect(404);
      const other = await makeOtherCompany(api.ds);
      const otherQa = await signIn(api.app, other.qa.email, TEST_PASSWORD);
      await otherQa.get('/api/welds/job-summary.csv?job=JOB-SUM').expect(404);
    });
  });

  describe('welds as evidence of continuity', () => {
    it('a weld and a logged entry of the same day count once, and the weld alone keeps the pair in force', async () => {
      const w = await world(5);
      const d = daysAgo(3);
      await log(w, { weldedOn: d, weldNumber: '1' });
      await log(w, { weldedOn: d, weldNumber: '2' });
      await makeUse(api.ds, { org: w.org, shop: w.shopA, welder: w.a1, process: 'SMAW', usedOn: d });
      const { recomputeAll, storedStates, refreshContinuityState } = await import('../../../apps/api/src/continuity/continuity-state.repository.js');
      await refreshContinuityState(api.ds.manager, w.a1.id, 'SMAW', 'asme-ix');
      const stored = await storedStates(api.ds.manager, { organizationId: w.org.id, welderId: w.a1.id });
      const recomputed = await recomputeAll(api.ds.manager, { organizationId: w.org.id, welderId: w.a1.id });
      expect(stored).toEqual(recomputed);
      expect(stored[0]).toMatchObject({ lastEvidence: d, lapsesOn: addMonths(d, 6), ignored: [] });
    });
  });
});
