// Welds newly flagged by a re-check are raised in the lapse-watch digest as well as in the review queue
// (issue 12, "Re-checking"), through the same outbox: the next run's digest names each weld (job, weld
// number, welder stamp, reason with its clause) to the supervisors of the weld's shop; a weld that has
// meanwhile been dispositioned is dropped before sending; a weld is told about once. Read from the mail catcher.
import { rm } from 'node:fs/promises';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { addMonths, weldDetailSchema, weldSchema } from '@beadroll/rules';
import { startMailCatcher, type MailCatcher } from '../../../docker-free-scripts/mail-catcher.js';
import { sendDueNotices } from '../../../apps/api/src/lapse-watch/lapse-sender.js';
import { bodyOf, signIn, startTestApi, testConfig, type TestApi } from '../../support/api-app.js';
import { TEST_PASSWORD } from '../../support/factories.js';
import { daysAgo } from '../../support/api-records.js';
import { mailsTo, waitForMail } from '../../support/mail.js';
import { makeContinuityProcedure } from '../continuity/continuity-factories.js';
import { freePort, mailFolder, makeLapseWorld } from '../lapse-watch/lapse-factories.js';
import { certify, weldBody } from './weld-factories.js';

const today = () => new Date().toISOString().slice(0, 10);

describe('welds flagged by a re-check in the lapse-watch digest', () => {
  let api: TestApi;
  let catcher: MailCatcher;
  let dir: string;
  beforeAll(async () => {
    dir = await mailFolder();
    const port = await freePort();
    catcher = await startMailCatcher({ port, dir });
    api = await startTestApi({ config: { smtp: { ...testConfig().smtp, port } } });
  });
  afterAll(async () => {
    await api.close();
    await catcher.close();
    await rm(dir, { recursive: true, force: true });
  });

  /** A company whose welder A-01 (home shop A) holds a qualification tested 3 months ago, and one weld after it. */
  async function world(weldNumber: string) {
    const w = await makeLapseWorld(api.ds);
    const wps = await makeContinuityProcedure(api.ds, w.org);
    const a1 = w.weldersA[0]!;
    const qualificationId = await certify(api.ds, { org: w.org, shop: w.shopA, welder: a1, procedureId: wps, by: w.qa, testedOn: addMonths(today(), -3) });
    const qaAgent = await signIn(api.app, w.qa.email, TEST_PASSWORD);
    const foremanAgent = await signIn(api.app, w.foreman.email, TEST_PASSWORD);
    const weld = bodyOf(
      weldSchema,
      await foremanAgent.post('/api/welds').send(weldBody({ shopId: w.shopA.id, welderId: a1.id }, { weldNumber, weldedOn: daysAgo(5) })).expect(201),
    );
    expect(weld.flagged).toBe(false);
    // From memory: QW-322.1(b) — a qualification revoked for cause; welds made from that day on are outside it.
    const revoke = () =>
      qaAgent.post(`/api/qualifications/${qualificationId}/revoke`).send({ revokedOn: daysAgo(10), reason: 'Rejected radiographs on job HPF-2433' }).expect(200);
    const run = () => qaAgent.post('/api/lapse-watch/runs').send({}).expect(201);
    return { ...w, a1, qaAgent, weld, revoke, run };
  }

  it("names a weld a back-dated revocation flagged in the next run's digest, to the supervisors of its shop only, once", async () => {
    const w = await world('7');
    await w.revoke();
    const flagged = bodyOf(weldDetailSchema, await w.qaAgent.get(`/api/welds/${w.weld.id}`).expect(200));
    expect(flagged).toMatchObject({ flagged: true, reviewStatus: 'pending' });
    const reason = flagged.passes[0]!.reasons.find((r) => r.variable === 'revoked')!;
    expect(reason.clause).not.toBe('');

    await w.run();
    for (const to of [w.qa.email, w.qa2.email, w.foreman.email]) {
      const mail = await waitForMail(dir, to);
      expect(mail.subject).toContain('1 weld flagged');
      expect(mail.text).toContain(`Job HPF-2433 weld 7 · welded ${daysAgo(5)}`);
      expect(mail.text).toContain(`A-01 Ada Quenby · SMAW: `);
      expect(mail.text).toContain(`${reason.message} (${reason.clause})`);
      expect(mail.text).toContain('re-checked because a qualification was revoked with an earlier date');
      expect(mail.text).toContain(`/welds/${w.weld.id}`);
      expect(mail.html).toContain(`${reason.clause}`);
      expect(mail.html).toContain('HPF-2433');
    }
    // The foreman of shop B does not supervise the weld's shop.
    expect(await mailsTo(dir, w.foremanB.email)).toEqual([]);

    // Told once: a later send has nothing more to say about it.
    await sendDueNotices(api.deps, { organizationIds: [w.org.id] });
    expect(await mailsTo(dir, w.qa.email)).toHaveLength(1);
    const deliveries = await api.ds.query<{ status: string; n: number }[]>(
      `SELECT d.status, count(*)::int AS n FROM notice_deliveries d JOIN weld_flag_notices n ON n.id = d.weld_notice_id
        WHERE n.weld_id = $1 GROUP BY d.status`,
      [w.weld.id],
    );
    expect(deliveries).toEqual([{ status: 'sent', n: 3 }]);
  });

  it('drops a weld dispositioned before the digest went, with the reason (re-checked before sending)', async () => {
    const w = await world('8');
    await w.revoke();
    await w.qaAgent.post(`/api/welds/${w.weld.id}/disposition`).send({ decision: 'cut-out', reason: 'Cut out and rewelded by B-01' }).expect(200);
    await w.run();
    for (const to of [w.qa.email, w.foreman.email]) {
      for (const mail of await mailsTo(dir, to)) expect(mail.text).not.toContain('weld 8');
    }
    const reasons = await api.ds.query<{ status: string; reason: string }[]>(
      `SELECT d.status, d.superseded_reason AS reason FROM notice_deliveries d JOIN weld_flag_notices n ON n.id = d.weld_notice_id
        WHERE n.weld_id = $1`,
      [w.weld.id],
    );
    expect(reasons.length).toBe(3);
    for (const r of reasons) expect(r).toEqual({ status: 'superseded', reason: 'The weld has a disposition' });
  });
});
