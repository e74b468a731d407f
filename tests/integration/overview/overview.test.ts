// GET /api/overview: counts by state per shop and the lapses due in the next 90 days by week, for the
// QA manager (every shop) and a foreman (their shops), against the real PostgreSQL.
import { addDays, format, startOfWeek } from 'date-fns';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { lapseWatchRunListSchema, overviewSchema } from '@beadroll/rules';
import { bodyOf, errorOf, signIn, startTestApi, type TestApi } from '../../support/api-app.js';
import { QueryLog } from '../../support/api-query-log.js';
import { TEST_PASSWORD } from '../../support/factories.js';
import { makeFlaggedEntry, makeLapseWorld, makeQualification } from '../lapse-watch/lapse-factories.js';

const day = (d: Date) => format(d, 'yyyy-MM-dd');
const today = new Date();
const inDays = (n: number) => day(addDays(today, n));
// Weeks start on Monday, as in ISO 8601 week dates (date-fns startOfWeek with weekStartsOn: 1).
const weekOf = (n: number) => day(startOfWeek(addDays(today, n), { weekStartsOn: 1 }));

describe('GET /api/overview', () => {
  let api: TestApi;
  const log = new QueryLog();
  beforeAll(async () => {
    api = await startTestApi({ dataSourceOptions: { logger: log } });
  });
  afterAll(() => api.close());

  async function scenario() {
    const w = await makeLapseWorld(api.ds);
    const [a1, a2, a3] = w.weldersA;
    const [b1, b2] = w.weldersB;
    const q = (welder: typeof a1, over: Parameters<typeof makeQualification>[4]) =>
      makeQualification(api.ds, w.org, w.qa, welder!, over);
    await q(a1, { lapsesOn: inDays(100), lastEvidence: inDays(-80) }); // current
    await q(a2, { lapsesOn: inDays(10), lastEvidence: inDays(-170) }); // lapsing
    await q(a2, { process: 'GTAW', lapsesOn: inDays(-5), lastEvidence: inDays(-190) }); // lapsed
    await q(a1, { process: 'FCAW', lapsesOn: inDays(40), lastEvidence: inDays(-140), revokedOn: inDays(-1) }); // revoked
    await q(a3, { lapsesOn: inDays(15), lastEvidence: inDays(-165) }); // welder has left: not counted
    await q(b1, { lapsesOn: inDays(20), lastEvidence: inDays(-160) }); // lapsing
    await q(b1, { process: 'GTAW', lapsesOn: inDays(75), lastEvidence: inDays(-105) }); // current, due in 75 days
    await q(b2, { lapsesOn: inDays(200), lastEvidence: inDays(-10) }); // current, beyond 90 days
    // Use logged after A-02's GTAW lapsed, once in shop A and once (travelling) in shop B.
    await makeFlaggedEntry(api.ds, w.org, a2!, w.shopA.id, inDays(-2));
    await makeFlaggedEntry(api.ds, w.org, a2!, w.shopB.id, inDays(-1));
    return w;
  }

  it('counts every shop for the QA manager and charts the next 90 days by week', async () => {
    const w = await scenario();
    const qa = await signIn(api.app, w.qa.email, TEST_PASSWORD);
    const res = await qa.get('/api/overview');
    expect(res.status).toBe(200);
    const o = bodyOf(overviewSchema, res);
    expect(o.asOf).toBe(day(today));
    expect(o.counts).toEqual([
      {
        shop: { id: w.shopA.id, name: 'Alpha Bay', code: 'AA' },
        current: 1,
        lapsing: 1,
        lapsed: 1,
        revoked: 1,
      },
      {
        shop: { id: w.shopB.id, name: 'Beta Yard', code: 'BB' },
        current: 2,
        lapsing: 1,
        lapsed: 0,
        revoked: 0,
      },
    ]);
    // Every week from the one holding tomorrow to the one holding day 90, zeros included.
    expect(o.lapsesByWeek[0]!.weekStart).toBe(weekOf(1));
    expect(o.lapsesByWeek.at(-1)!.weekStart).toBe(weekOf(90));
    expect(o.lapsesByWeek.length).toBeGreaterThanOrEqual(13);
    const nonZero = Object.fromEntries(
      o.lapsesByWeek.filter((x) => x.count > 0).map((x) => [x.weekStart, x.count]),
    );
    const expected: Record<string, number> = {};
    for (const n of [10, 20, 75]) expected[weekOf(n)] = (expected[weekOf(n)] ?? 0) + 1;
    expect(nonZero).toEqual(expected);
    expect(o).toMatchObject({ reviewQueue: 2, latestRun: null, failedDeliveries: 0 });
  });

  it("limits a foreman to their shops' welders", async () => {
    const w = await scenario();
    const foreman = await signIn(api.app, w.foreman.email, TEST_PASSWORD);
    const o = bodyOf(overviewSchema, await foreman.get('/api/overview'));
    expect(o.counts).toEqual([
      {
        shop: { id: w.shopA.id, name: 'Alpha Bay', code: 'AA' },
        current: 1,
        lapsing: 1,
        lapsed: 1,
        revoked: 1,
      },
    ]);
    expect(o.lapsesByWeek.reduce((n, x) => n + x.count, 0)).toBe(1);
    expect(o.lapsesByWeek.find((x) => x.count > 0)?.weekStart).toBe(weekOf(10));
    expect(o.reviewQueue).toBe(1);
  });

  it('counts lapsing against the company lead time', async () => {
    const w = await scenario();
    const qa = await signIn(api.app, w.qa.email, TEST_PASSWORD);
    expect((await qa.patch('/api/settings').send({ warnDays: [7] })).status).toBe(200);
    const o = bodyOf(overviewSchema, await qa.get('/api/overview'));
    expect(o.counts.map((c) => [c.shop.code, c.current, c.lapsing])).toEqual([
      ['AA', 2, 0],
      ['BB', 3, 0],
    ]);
  });

  it('answers in one query after the session lookup, with the latest lapse-watch run as the run list shows it', async () => {
    const w = await scenario();
    const qa = await signIn(api.app, w.qa.email, TEST_PASSWORD);
    expect((await qa.post('/api/lapse-watch/runs').send({})).status).toBe(201);
    const runs = bodyOf(lapseWatchRunListSchema, await qa.get('/api/lapse-watch/runs'));
    log.clear();
    const o = bodyOf(overviewSchema, await qa.get('/api/overview'));
    expect(log.queries.filter((q) => /^\s*(SELECT|WITH)/i.test(q))).toHaveLength(2);
    expect(o.latestRun).toEqual(runs.items[0]);
    expect(o.reviewQueue).toBe(2);
    expect(o.failedDeliveries).toBe(0);
    const foreman = await signIn(api.app, w.foreman.email, TEST_PASSWORD);
    log.clear();
    bodyOf(overviewSchema, await foreman.get('/api/overview'));
    expect(log.queries.filter((q) => /^\s*(SELECT|WITH)/i.test(q))).toHaveLength(2);
  });

  it('is refused to a welder (403) and shows nothing of another company', async () => {
    const w = await scenario();
    const welder = await signIn(api.app, w.welder.email, TEST_PASSWORD);
    const res = await welder.get('/api/overview');
    expect(res.status).toBe(403);
    expect(errorOf(res).code).toBe('forbidden');
    const other = await makeLapseWorld(api.ds);
    const otherQa = await signIn(api.app, other.qa.email, TEST_PASSWORD);
    const o = bodyOf(overviewSchema, await otherQa.get('/api/overview'));
    expect(o.counts.every((c) => c.current + c.lapsing + c.lapsed + c.revoked === 0)).toBe(true);
    expect(o.lapsesByWeek.every((x) => x.count === 0)).toBe(true);
  });
});
