// GET /api/crew-finder (issue 12): who may weld a joint from today through a day, sorted by who stays
// qualified longest, and the near misses with the one reason each; scoped to the caller's shops.
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { addDays, addMonths, crewFinderAnswerSchema, type CouponInput } from '@beadroll/rules';
import { bodyOf, errorOf, signIn, startTestApi, type TestApi } from '../../support/api-app.js';
import { makeWelder, makeWorld, TEST_PASSWORD, type WelderRow } from '../../support/factories.js';
import { joint6inSch80, logUse, makeProcedureFor, makeQualification, pipe6G } from './qualified-on-factories.js';

const today = () => new Date().toISOString().slice(0, 10);

describe('GET /api/crew-finder', () => {
  let api: TestApi;
  beforeAll(async () => {
    api = await startTestApi();
  });
  afterAll(() => api.close());

  it('lists who may weld 6 in Sch 80 pipe in 6G through the range, longest first, and the near misses with one reason each', async () => {
    const w = await makeWorld(api.ds);
    const wps = await makeProcedureFor(api.ds, w.org);
    const t = today();
    const welder = (stamp: string, name: string) => makeWelder(api.ds, w.org, w.shopA, { stamp, name });
    const qualify = (wd: WelderRow, testedOn: string, more: { coupon?: CouponInput; revokedOn?: string } = {}) =>
      makeQualification(api.ds, { org: w.org, shop: w.shopA, welder: wd, procedureId: wps, qa: w.qa, testedOn, ...more });
    const use = (wd: WelderRow, usedOn: string) => logUse(api.ds, { org: w.org, shop: w.shopA, welder: wd, usedOn, by: w.foreman });
    // from memory: QW-322.1(a): in force until 6 months after the last use.
    const long = await welder('C-10', 'Long Stayer');
    await qualify(long, addMonths(t, -5));
    await use(long, addDays(t, -3));
    const short = await welder('C-11', 'Short Stayer');
    await qualify(short, addMonths(t, -8));
    await use(short, addDays(addMonths(t, -6), 60));
    // Lapses 20 days from now: inside a 6-week range.
    const lapsing = await welder('C-12', 'Soon Lapsing');
    await qualify(lapsing, addMonths(t, -9));
    await use(lapsing, addDays(addMonths(t, -6), 20));
    // Out of range by one variable: a 1G plate test qualifies groove welds flat only (from memory: QW-461.9).
    const plate = await welder('C-13', 'Plate Only');
    await qualify(plate, addDays(t, -30), {
      coupon: { ...pipe6G, form: 'plate', position: '1G', outsideDiameter: undefined, thickness: { value: 0.5, unit: 'in' } },
    });
    const lapsed = await welder('C-14', 'Long Lapsed');
    await qualify(lapsed, addMonths(t, -14));
    const revoked = await welder('C-15', 'Revoked Rita');
    await qualify(revoked, addDays(t, -40), { revokedOn: addDays(t, -2) });
    // Two variables out (position and F-No.): neither crew nor near miss.
    const far = await welder('C-16', 'Far Off');
    await qualify(far, addDays(t, -30), {
      coupon: { ...pipe6G, form: 'plate', position: '1G', outsideDiameter: undefined, thickness: { value: 0.5, unit: 'in' }, fNumber: 1 },
    });

    const qa = await signIn(api.app, w.qa.email, TEST_PASSWORD);
    const ask = async (through: string, more: Record<string, string> = {}) => {
      const res = await qa.get('/api/crew-finder').query({ process: 'SMAW', through, ...joint6inSch80, ...more });
      expect(res.status, JSON.stringify(res.body)).toBe(200);
      return bodyOf(crewFinderAnswerSchema, res);
    };
    const sixWeeks = addDays(t, 42);
    const a = await ask(sixWeeks);
    expect(a.asked).toMatchObject({ from: t, through: sixWeeks, positions: ['F', 'H', 'V', 'O'] });
    expect(a.crew.items.map((m) => m.welder.stamp)).toEqual(['C-10', 'C-11']);
    expect(a.crew.total).toBe(2);
    expect(a.crew.items[0]!.lapsesOn > a.crew.items[1]!.lapsesOn).toBe(true);
    const near = new Map(a.nearMisses.items.map((n) => [n.welder.stamp, n]));
    expect([...near.keys()].sort()).toEqual(['C-12', 'C-13', 'C-14', 'C-15']);
    expect(near.get('C-12')).toMatchObject({ kind: 'lapses-in-range', reason: { variable: 'lapsed', clause: 'QW-322.1(a)' } });
    expect(near.get('C-13')).toMatchObject({ kind: 'out-of-range', reason: { variable: 'position', clause: 'QW-461.9' } });
    expect(near.get('C-14')).toMatchObject({ kind: 'lapsed' });
    expect(near.get('C-15')).toMatchObject({ kind: 'revoked', reason: { clause: 'QW-322.1(b)' } });
    expect(a.notice).toMatch(/inspector/);

    // One page at a time, with the exact totals: the second of the crew, the near misses two by two.
    const second = await ask(sixWeeks, { limit: '1', offset: '1', nearLimit: '2', nearOffset: '2' });
    expect(second.crew).toMatchObject({ total: 2, offset: 1, limit: 1 });
    expect(second.crew.items.map((m) => m.welder.stamp)).toEqual(['C-11']);
    expect(second.nearMisses).toMatchObject({ total: 4, offset: 2, limit: 2 });
    expect(second.nearMisses.items.map((n) => n.welder.stamp)).toEqual(a.nearMisses.items.slice(2).map((n) => n.welder.stamp));

    // Through today only, the one lapsing in 20 days is on the crew.
    expect((await ask(t)).crew.items.map((m) => m.welder.stamp)).toEqual(['C-10', 'C-11', 'C-12']);
    // A shop with none of them.
    expect((await ask(t, { shopId: w.shopB.id })).crew.total).toBe(0);

    // A foreman searches the welders of their shops; a welder may not search.
    const foreman = await signIn(api.app, w.foreman.email, TEST_PASSWORD);
    const fa = await foreman.get('/api/crew-finder').query({ process: 'SMAW', ...joint6inSch80 });
    expect(fa.status).toBe(200);
    expect((await foreman.get('/api/crew-finder').query({ process: 'SMAW', shopId: w.shopB.id, ...joint6inSch80 })).status).toBe(404);
    const welderSession = await signIn(api.app, w.welder.email, TEST_PASSWORD);
    expect((await welderSession.get('/api/crew-finder').query({ process: 'SMAW', ...joint6inSch80 })).status).toBe(403);
  });

  it('refuses a range ending before today, naming the field', async () => {
    const w = await makeWorld(api.ds);
    const qa = await signIn(api.app, w.qa.email, TEST_PASSWORD);
    const res = await qa.get('/api/crew-finder').query({ process: 'SMAW', through: '2020-01-01', ...joint6inSch80 });
    expect(res.status).toBe(400);
    expect(Object.keys(errorOf(res).fields ?? {})).toEqual(['through']);
  });

  it('refuses a page size of none or over the most, naming the field', async () => {
    const w = await makeWorld(api.ds);
    const qa = await signIn(api.app, w.qa.email, TEST_PASSWORD);
    for (const [field, value] of [['limit', '0'], ['nearLimit', '5000'], ['offset', '-1']] as const) {
      const res = await qa.get('/api/crew-finder').query({ process: 'SMAW', ...joint6inSch80, [field]: value });
      expect(res.status).toBe(400);
      expect(Object.keys(errorOf(res).fields ?? {})).toEqual([field]);
    }
  });
});
