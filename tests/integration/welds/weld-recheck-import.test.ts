// A continuity import that re-dates logged use re-checks the welds that use kept in force, like a re-dated
// entry of the grid (issue 12, "Re-checking"): a weld newly outside goes back to the review queue (and the
// lapse-watch digest's outbox); a weld the new day covers again is cleared. Dates: ASME IX continuity lapses
// six months after the last documented use (from memory: QW-322.1(a)).
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { addDays, addMonths, weldDetailSchema, weldSchema } from '@beadroll/rules';
import { bodyOf, signIn, startTestApi, type TestApi } from '../../support/api-app.js';
import { auditRows, makeWorld, TEST_PASSWORD } from '../../support/factories.js';
import { csv, importFile } from '../../support/imports.js';
import { makeContinuityProcedure, makeUse } from '../continuity/continuity-factories.js';
import { certify, weldBody } from './weld-factories.js';

const today = () => new Date().toISOString().slice(0, 10);

describe('re-checking welds on a continuity import', () => {
  let api: TestApi;
  beforeAll(async () => {
    api = await startTestApi();
  });
  afterAll(() => api.close());

  it('flags the welds a re-dated use no longer covers, and clears them when the import puts the day back', async () => {
    const w = await makeWorld(api.ds);
    const wps = await makeContinuityProcedure(api.ds, w.org);
    const a1 = w.weldersA[0]!;
    // The weld on the 15th of last month; the use six months and a day before kept the welder in force.
    const weldedOn = addMonths(`${today().slice(0, 7)}-15`, -1);
    const usedOn = addDays(addMonths(weldedOn, -6), 1);
    const earlier = `${usedOn.slice(0, 7)}-02`;
    await certify(api.ds, { org: w.org, shop: w.shopA, welder: a1, procedureId: wps, by: w.qa, testedOn: addMonths(usedOn, -2) });
    await makeUse(api.ds, { org: w.org, shop: w.shopA, welder: a1, process: 'SMAW', usedOn, job: 'J-3310' });
    const { refreshContinuityState } = await import('../../../apps/api/src/continuity/continuity-state.repository.js');
    await refreshContinuityState(api.ds.manager, a1.id, 'SMAW', 'asme-ix');
    const qa = await signIn(api.app, w.qa.email, TEST_PASSWORD);
    const foreman = await signIn(api.app, w.foreman.email, TEST_PASSWORD);
    const weld = bodyOf(weldSchema, await foreman.post('/api/welds').send(weldBody({ shopId: w.shopA.id, welderId: a1.id }, { weldNumber: '21', weldedOn })).expect(201));
    expect(weld.flagged).toBe(false);

    const sheet = (day: string) => csv([['Stamp', 'Process', 'Date', 'Job', 'Shop'], ['A-01', 'SMAW', day, 'J-3310', 'AA']]);
    const read = async () => bodyOf(weldDetailSchema, await qa.get(`/api/welds/${weld.id}`).expect(200));

    // Re-dated to the 2nd of that month: the lapse falls before the weld.
    expect((await importFile(qa, 'continuity', sheet(earlier), 'continuity.csv')).status).toBe('committed');
    const flagged = await read();
    expect(flagged).toMatchObject({ flagged: true, reviewStatus: 'pending' });
    expect(flagged.passes[0]!.qualified).toBe(false);
    expect((await auditRows(api.ds, weld.id)).map((a) => a.action)).toEqual(['weld.created', 'weld.flagged-on-recheck']);
    const notices = await api.ds.query<{ cause: string }[]>(`SELECT cause FROM weld_flag_notices WHERE weld_id = $1`, [weld.id]);
    expect(notices).toEqual([{ cause: 'continuity-import' }]);

    // Put back on the original day: the weld is covered again and leaves the queue.
    await importFile(qa, 'continuity', sheet(usedOn), 'continuity.csv');
    expect(await read()).toMatchObject({ flagged: false, reviewStatus: null });
    expect((await auditRows(api.ds, weld.id)).map((a) => a.action)).toEqual([
      'weld.created',
      'weld.flagged-on-recheck',
      'weld.cleared-on-recheck',
    ]);
  });
});
