// GET /api/welders/:id/qualified-on (issue 12): was the welder qualified for this joint on that day, with
// the proof. One test per reason a weld can be outside a qualification: each joint variable out of range
// (with its clause), lapsed, revoked, renewed after a lapse (judged as of the day, not today), use logged
// after a lapse (it renews nothing), superseded, tested after the day; and the scoping of the route.
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { qualifiedOnAnswerSchema, type CouponInput } from '@beadroll/rules';
import { bodyOf, errorOf, signIn, startTestApi, type TestApi } from '../../support/api-app.js';
import { makeOtherCompany, makeWorld, TEST_PASSWORD } from '../../support/factories.js';
import { joint6inSch80, logUse, makeProcedureFor, makeQualification, pipe6G } from './qualified-on-factories.js';

describe('GET /api/welders/:id/qualified-on', () => {
  let api: TestApi;
  beforeAll(async () => {
    api = await startTestApi();
  });
  afterAll(() => api.close());

  async function world() {
    const w = await makeWorld(api.ds);
    const wps = await makeProcedureFor(api.ds, w.org);
    const qa = await signIn(api.app, w.qa.email, TEST_PASSWORD);
    const welder = w.weldersA[0]!;
    const qualify = (testedOn: string, more: { coupon?: CouponInput; revokedOn?: string; supersedes?: string } = {}) =>
      makeQualification(api.ds, { org: w.org, shop: w.shopA, welder, procedureId: wps, qa: w.qa, testedOn, ...more });
    const use = (usedOn: string, job = 'HPF-2433') =>
      logUse(api.ds, { org: w.org, shop: w.shopB, welder, usedOn, job, by: w.foreman });
    const ask = async (date: string, joint: Record<string, string> = joint6inSch80, process = 'SMAW') => {
      const res = await qa.get(`/api/welders/${welder.id}/qualified-on`).query({ date, process, ...joint });
      expect(res.status, JSON.stringify(res.body)).toBe(200);
      return bodyOf(qualifiedOnAnswerSchema, res);
    };
    return { ...w, qa, welder, qualify, use, ask };
  }

  it('answers yes for 6 in Sch 80 pipe in 6G on a day in continuity, with the proof chain', async () => {
    const w = await world();
    const { qualificationId, number } = await w.qualify('2025-09-02');
    await w.use('2025-11-14', 'HPF-2433');
    await w.use('2026-02-20', 'HPF-2440');
    const a = await w.ask('2026-03-14');
    expect(a.qualified).toBe(true);
    expect(a.qualificationId).toBe(qualificationId);
    expect(a.reasons).toEqual([]);
    expect(a.notice).toMatch(/code edition in force.*quality manual.*inspector/);
    // ASME B36.10M: NPS 6 = 6.625 in OD, Sch 80 wall 0.432 in (TRADE.md §7).
    expect(a.evidence.asked.joint).toMatchObject({ outsideDiameter: { value: 6.625, unit: 'in' }, thickness: { value: 0.432, unit: 'in' } });
    // A fixed pipe at 45° is welded in every position.
    expect(a.evidence.asked.positions).toEqual(['F', 'H', 'V', 'O']);
    const proof = a.evidence.qualifications[0]!;
    expect(proof).toMatchObject({ number, qualified: true, coupon: { testedOn: '2025-09-02', testPosition: '6G' } });
    expect(proof.limits.length).toBeGreaterThan(3);
    expect(proof.limits.every((l) => l.clause.length > 0)).toBe(true);
    // from memory: QW-322.1(a): in force until 6 months after the last use before the day (2026-02-20).
    expect(proof.continuity).toMatchObject({ inForce: true, state: 'in-force', lastEvidence: '2026-02-20', lapsesOn: '2026-08-20', clause: 'QW-322.1(a)' });
    const chain = proof.continuity.evidence;
    expect(chain.map((e) => [e.date, e.kind, e.source, e.counted])).toEqual([
      ['2025-09-02', 'test', 'coupon', true],
      ['2025-11-14', 'use', 'continuity-log', true],
      ['2026-02-20', 'use', 'continuity-log', true],
    ]);
    expect(chain[1]).toMatchObject({ job: 'HPF-2433', shop: 'Beta Yard', loggedBy: 'Fern Oakes' });
    expect(chain[1]!.loggedAt).toMatch(/^\d{4}-\d{2}-\d{2}T/);
  });

  // Each joint variable out of range, with the clause the rules name (from memory: the ASME IX clauses of
  // TRADE.md §3–5; the clause is the one on the qualification's own limits).
  const cases: { variable: string; clause: string; also?: string[]; coupon?: CouponInput; joint: Record<string, string> }[] = [
    // QW-461.9: a 1G plate test qualifies groove welds flat only.
    {
      variable: 'position',
      clause: 'QW-461.9',
      coupon: { ...pipe6G, form: 'plate', position: '1G', outsideDiameter: undefined, thickness: { value: 0.375, unit: 'in' } },
      joint: { form: 'plate', weld: 'groove', position: 'V', thickness: '3/8', backing: 'without', fNumber: '4', progression: 'uphill' },
    },
    // QW-452.1(b): t = 0.432 in under 1/2 in qualifies up to 2t = 0.864 in.
    { variable: 'thickness', clause: 'QW-452.1(b)', joint: { ...joint6inSch80, nps: '6', schedule: '80', thickness: '1 in' } },
    // QW-452.3: a coupon over 2-7/8 in OD qualifies 2-7/8 in OD and over; NPS 2 is 2.375 in.
    { variable: 'diameter', clause: 'QW-452.3', joint: { ...joint6inSch80, nps: '2', schedule: '80' } },
    // QW-433: F-No. 4 qualifies F-No. 1 to 4, not F-No. 5.
    { variable: 'fNumber', clause: 'QW-433', joint: { ...joint6inSch80, fNumber: '5' } },
    // QW-402.4: welded with backing qualifies with backing only; QW-433 then allows its F-Nos with backing only.
    { variable: 'backing', clause: 'QW-402.4', also: ['fNumber'], coupon: { ...pipe6G, backing: true }, joint: { ...joint6inSch80, fNumber: '1' } },
    // QW-405.3: uphill and downhill qualify separately.
    { variable: 'progression', clause: 'QW-405.3', joint: { ...joint6inSch80, progression: 'downhill' } },
  ];
  for (const c of cases)
    it(`answers no when the ${c.variable} is out of range, naming ${c.clause} (from memory: ${c.clause})`, async () => {
      const w = await world();
      const { qualificationId } = await w.qualify('2025-09-02', c.coupon ? { coupon: c.coupon } : {});
      await w.use('2026-02-20');
      const a = await w.ask('2026-03-14', c.joint);
      expect(a.qualified).toBe(false);
      expect(a.qualificationId).toBe(qualificationId);
      expect(a.reasons.map((r) => r.variable).sort()).toEqual([c.variable, ...(c.also ?? [])].sort());
      const reason = a.reasons.find((r) => r.variable === c.variable);
      expect(reason?.clause).toContain(c.clause);
      expect(reason?.qualificationId).toBe(qualificationId);
      expect(a.evidence.qualifications[0]!.continuity.inForce).toBe(true);
    });

  it('answers lapsed on a day six months after the last use (from memory: QW-322.1(a))', async () => {
    const w = await world();
    await w.qualify('2024-01-10');
    await w.use('2024-03-01');
    const before = await w.ask('2024-08-31');
    expect(before.qualified).toBe(true);
    const a = await w.ask('2024-09-01');
    expect(a.qualified).toBe(false);
    expect(a.reasons).toEqual([expect.objectContaining({ variable: 'lapsed', clause: 'QW-322.1(a)' })]);
    expect(a.reasons[0]!.message).toContain('2024-09-01');
    expect(a.evidence.qualifications[0]!.continuity).toMatchObject({ state: 'lapsed', lapsesOn: '2024-09-01', lastEvidence: '2024-03-01' });
  });

  it('judges a pair renewed since as lapsed on a day inside the gap, and in force after the renewal test (from memory: QW-322.2(a))', async () => {
    const w = await world();
    const first = await w.qualify('2024-01-10');
    await w.use('2024-03-01');
    // A renewal test after the lapse of 2024-09-01, on a 2G plate (any position renews the process).
    const renewal = await w.qualify('2025-01-15', {
      coupon: { ...pipe6G, form: 'plate', position: '2G', outsideDiameter: undefined, thickness: { value: 0.5, unit: 'in' } },
    });
    await w.use('2025-03-03');
    const inGap = await w.ask('2024-11-20');
    expect(inGap.qualified).toBe(false);
    expect(inGap.reasons.filter((r) => r.qualificationId === first.qualificationId).map((r) => r.variable)).toEqual(['lapsed']);
    // The renewal's own WPQ was not yet tested on that day.
    expect(inGap.reasons.filter((r) => r.qualificationId === renewal.qualificationId).map((r) => r.variable)).toContain('not-yet-qualified');
    // After the renewal, the first WPQ (6G pipe) is back in force: QW-322.2(a) renews every qualification of the process.
    const after = await w.ask('2025-04-01');
    expect(after.qualified).toBe(true);
    expect(after.qualificationId).toBe(first.qualificationId);
    const chain = after.evidence.qualifications.find((q) => q.id === first.qualificationId)!.continuity;
    expect(chain).toMatchObject({ inForce: true, renewedOn: '2025-01-15', lastTest: '2025-01-15', lapsesOn: '2025-09-03' });
    expect(chain.evidence[0]).toMatchObject({ date: '2025-01-15', kind: 'test', renewal: true, counted: true });
  });

  it('does not let use logged after the lapse revive the qualification, and shows it as flagged evidence', async () => {
    const w = await world();
    await w.qualify('2024-01-10');
    await w.use('2024-03-01');
    const late = await w.use('2024-10-15', 'HPF-2501');
    const a = await w.ask('2024-11-01');
    expect(a.qualified).toBe(false);
    expect(a.reasons.map((r) => r.variable)).toEqual(['lapsed']);
    const row = a.evidence.qualifications[0]!.continuity.evidence.find((e) => e.entryId === late)!;
    expect(row).toMatchObject({ counted: false, flagged: true, reviewStatus: 'pending', job: 'HPF-2501' });
    expect(row.note).toMatch(/after the lapse/);
  });

  it('answers revoked from the revocation date on, and in force before it (from memory: QW-322.1(b))', async () => {
    const w = await world();
    const { qualificationId } = await w.qualify('2024-01-10', { revokedOn: '2024-06-01' });
    await w.use('2024-03-01');
    await w.use('2024-05-02');
    expect((await w.ask('2024-05-31')).qualified).toBe(true);
    const a = await w.ask('2024-06-15');
    expect(a.qualified).toBe(false);
    expect(a.reasons).toEqual([expect.objectContaining({ variable: 'revoked', clause: 'QW-322.1(b)', qualificationId })]);
    expect(a.evidence.qualifications[0]!.revocation).toMatchObject({ revokedOn: '2024-06-01', reason: 'Cracked root on production weld', by: 'Quinn Assay' });
  });

  it('answers no before the test day, and takes the newer WPQ once it supersedes the older one', async () => {
    const w = await world();
    expect((await w.ask('2025-06-01')).reasons.map((r) => r.variable)).toEqual(['qualification']);
    const old = await w.qualify('2025-01-06');
    const newer = await w.qualify('2025-05-05', { supersedes: old.qualificationId });
    const early = await w.ask('2025-01-05');
    expect(early.qualified).toBe(false);
    expect(new Set(early.reasons.map((r) => r.variable))).toEqual(new Set(['not-yet-qualified']));
    expect((await w.ask('2025-03-01')).qualificationId).toBe(old.qualificationId);
    const later = await w.ask('2025-06-01');
    expect(later.qualificationId).toBe(newer.qualificationId);
    expect(later.evidence.qualifications.find((q) => q.id === old.qualificationId)!.continuity.state).toBe('superseded');
  });

  it('names the field of a bad query, and is scoped like the welder file', async () => {
    const w = await world();
    const other = await makeOtherCompany(api.ds);
    const url = `/api/welders/${w.welder.id}/qualified-on`;
    const badDate = await w.qa.get(url).query({ date: '2026-02-30', process: 'SMAW', ...joint6inSch80 });
    expect(badDate.status).toBe(400);
    expect(Object.keys(errorOf(badDate).fields ?? {})).toEqual(['date']);
    // ASME B36.10M has no NPS 7.
    const badPipe = await w.qa.get(url).query({ date: '2026-03-14', process: 'SMAW', ...joint6inSch80, nps: '7' });
    expect(badPipe.status).toBe(400);
    expect(Object.keys(errorOf(badPipe).fields ?? {})).toEqual(['nps']);
    const badSize = await w.qa.get(url).query({ date: '2026-03-14', process: 'SMAW', ...joint6inSch80, thickness: 'thick' });
    expect(Object.keys(errorOf(badSize).fields ?? {})).toEqual(['thickness']);
    const foreman = await signIn(api.app, w.foreman.email, TEST_PASSWORD);
    const q = { date: '2026-03-14', process: 'SMAW', ...joint6inSch80 };
    expect((await foreman.get(`/api/welders/${w.weldersA[1]!.id}/qualified-on`).query(q)).status).toBe(200);
    expect((await foreman.get(`/api/welders/${w.weldersB[0]!.id}/qualified-on`).query(q)).status).toBe(404);
    expect((await w.qa.get(`/api/welders/${other.welder.id}/qualified-on`).query(q)).status).toBe(404);
    const welder = await signIn(api.app, w.welder.email, TEST_PASSWORD);
    expect((await welder.get(`/api/welders/${w.welder.id}/qualified-on`).query(q)).status).toBe(200);
    expect((await welder.get(`/api/welders/${w.weldersA[1]!.id}/qualified-on`).query(q)).status).toBe(404);
  });
});
