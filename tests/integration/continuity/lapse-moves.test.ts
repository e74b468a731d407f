// refreshContinuityPairs reports the pairs whose lapse date moved (the lapse-event source), and keeps the
// welder's soonest lapse right when two processes of one welder are refreshed at the same moment.
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { addMonths } from '@beadroll/rules';
import { startTestApi, type TestApi } from '../../support/api-app.js';
import { makeWorld } from '../../support/factories.js';
import {
  refreshContinuityPairs,
  refreshContinuityStates,
} from '../../../apps/api/src/continuity/continuity-state.repository.js';
import { makeContinuityProcedure, makeTest, makeUse } from './continuity-factories.js';

describe('refreshContinuityPairs: lapse moves', () => {
  let api: TestApi;
  beforeAll(async () => {
    api = await startTestApi();
  });
  afterAll(() => api.close());

  it('returns before and after lapsesOn of each pair that moved, and nothing when nothing moved', async () => {
    const w = await makeWorld(api.ds);
    const wps = await makeContinuityProcedure(api.ds, w.org);
    const welder = w.weldersA[0]!;
    await makeTest(api.ds, { org: w.org, shop: w.shopA, welder, procedureId: wps, certifiedBy: w.qa, code: 'asme-ix', process: 'SMAW', testedOn: '2025-01-10', certify: true });
    await makeTest(api.ds, { org: w.org, shop: w.shopA, welder, procedureId: wps, certifiedBy: w.qa, code: 'aws-d1.1', process: 'SMAW', testedOn: '2025-01-10', certify: true });
    const created = await api.ds.transaction((db) => refreshContinuityStates(db, welder.id, 'SMAW'));
    // from memory: QW-322.1(a) (6 months) and AWS D1.1 4.2.3.1 (2015) (6 months + 1 day)
    expect(created).toEqual([
      { organizationId: w.org.id, welderId: welder.id, process: 'SMAW', code: 'asme-ix', before: null, after: '2025-07-10' },
      { organizationId: w.org.id, welderId: welder.id, process: 'SMAW', code: 'aws-d1.1', before: null, after: '2025-07-11' },
    ]);
    expect(await api.ds.transaction((db) => refreshContinuityStates(db, welder.id, 'SMAW'))).toEqual([]);

    await makeUse(api.ds, { org: w.org, shop: w.shopA, welder, process: 'SMAW', usedOn: '2025-03-03' });
    const moved = await api.ds.transaction((db) => refreshContinuityPairs(db, [{ welderId: welder.id, process: 'SMAW' }]));
    expect(moved.map((m) => [m.code, m.before, m.after])).toEqual([
      ['asme-ix', '2025-07-10', addMonths('2025-03-03', 6)],
      ['aws-d1.1', '2025-07-11', '2025-09-04'],
    ]);

  });

  it('defect 9: two processes of one welder refreshed at once both reach soonest_lapses_on', async () => {
    const w = await makeWorld(api.ds);
    const wps = await makeContinuityProcedure(api.ds, w.org);
    const welder = w.weldersA[0]!;
    await makeTest(api.ds, { org: w.org, shop: w.shopA, welder, procedureId: wps, certifiedBy: w.qa, code: 'asme-ix', process: 'SMAW', testedOn: '2025-01-10', certify: true });
    await makeTest(api.ds, { org: w.org, shop: w.shopA, welder, procedureId: wps, certifiedBy: w.qa, code: 'asme-ix', process: 'GTAW', testedOn: '2025-01-20', certify: true });
    await api.ds.transaction((db) => refreshContinuityPairs(db, [{ welderId: welder.id, process: 'SMAW' }, { welderId: welder.id, process: 'GTAW' }]));
    const soonest = async () =>
      (await api.ds.query<{ d: string }[]>(`SELECT to_char(soonest_lapses_on, 'YYYY-MM-DD') AS d FROM welders WHERE id = $1`, [welder.id]))[0]!.d;
    expect(await soonest()).toBe('2025-07-10');
    // Both processes move later in two transactions that overlap: SMAW to 2026-01-05, GTAW to 2025-12-01.
    // Without one lock per welder each computed the minimum from a snapshot without the other's change.
    const a = api.ds.createQueryRunner();
    const b = api.ds.createQueryRunner();
    await a.startTransaction();
    await b.startTransaction();
    try {
      await a.query(`INSERT INTO continuity_entries (organization_id, welder_id, shop_id, process, month, used_on, job_reference)
                     VALUES ($1, $2, $3, 'SMAW', '2025-07-01', '2025-07-05', 'J-A')`, [w.org.id, welder.id, w.shopA.id]);
      await b.query(`INSERT INTO continuity_entries (organization_id, welder_id, shop_id, process, month, used_on, job_reference)
                     VALUES ($1, $2, $3, 'GTAW', '2025-06-01', '2025-06-01', 'J-B')`, [w.org.id, welder.id, w.shopA.id]);
      await refreshContinuityPairs(a.manager, [{ welderId: welder.id, process: 'SMAW' }]);
      const second = refreshContinuityPairs(b.manager, [{ welderId: welder.id, process: 'GTAW' }]);
      await new Promise((r) => setTimeout(r, 150));
      await a.commitTransaction();
      await second;
      await b.commitTransaction();
    } finally {
      await a.release();
      await b.release();
    }
    // from memory: QW-322.1(a): GTAW used 2025-06-01 lapses 2025-12-01, the sooner of the two.
    expect(await soonest()).toBe('2025-12-01');
  });
});
