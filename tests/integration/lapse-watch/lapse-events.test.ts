// Lapse events from the refresh itself (defect 2): every path that moves a pair's lapse date — a new use,
// a deleted use, a re-dated use, a corrected coupon, a revocation, a renewal — writes its notice in the
// same transaction, and the sender's e-mail tells the supervisors, checked in the mail catcher.
// Dates: ASME IX continuity lapses 6 months after the last counted evidence (from memory: QW-322.1(a));
// the company warns 30 and 7 days ahead (defaults); "today" is 2026-06-01.
import { rm } from 'node:fs/promises';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { couponRecordSchema, qualificationSchema } from '@beadroll/rules';
import { startMailCatcher, type MailCatcher } from '../../../docker-free-scripts/mail-catcher.js';
import { sendDueNotices } from '../../../apps/api/src/lapse-watch/lapse-sender.js';
import { couponBody, makeProcedure } from '../../support/api-records.js';
import { bodyOf, signIn, startTestApi, testConfig, type TestApi } from '../../support/api-app.js';
import { TEST_PASSWORD, uniq, type WelderRow } from '../../support/factories.js';
import { mailsTo } from '../../support/mail.js';
import { makeUse } from '../continuity/continuity-factories.js';
import { freePort, mailFolder, makeLapseWorld, settableClock } from './lapse-factories.js';

describe('lapse events from the refresh', () => {
  let api: TestApi;
  let catcher: MailCatcher;
  let dir: string;
  const clock = settableClock('2026-06-01T12:00:00Z');
  beforeAll(async () => {
    dir = await mailFolder();
    const port = await freePort();
    catcher = await startMailCatcher({ port, dir });
    api = await startTestApi({ clock, config: { smtp: { ...testConfig().smtp, port } } });
  });
  afterAll(async () => {
    await api.close();
    await catcher.close();
    await rm(dir, { recursive: true, force: true });
  });

  /** A company, its QA manager's session, and a way to record and certify coupons through the API. */
  async function company() {
    const w = await makeLapseWorld(api.ds);
    const qa = await signIn(api.app, w.qa.email, TEST_PASSWORD);
    const wps = await makeProcedure(api.ds, w.org, { number: uniq('WPS') });
    const coupon = async (welder: WelderRow, testedOn: string) =>
      bodyOf(
        couponRecordSchema,
        await qa
          .post('/api/coupons')
          .send(couponBody({ welderId: welder.id, shopId: welder.homeShopId, procedureId: wps.id }, { testedOn }))
          .expect(201),
      );
    const certify = async (couponId: string, certifiedOn: string) =>
      bodyOf(
        qualificationSchema,
        await qa.post(`/api/coupons/${couponId}/certify`).send({ certifiedOn, version: 1 }).expect(201),
      );
    /** A save of the welder's SMAW cell in a month, sending the version of the cell as it stands. */
    const grid = async (welder: WelderRow, month: string, body: { usedOn?: string; remove?: boolean }) => {
      const [cell] = await api.ds.query<{ version: number }[]>(
        `SELECT version FROM continuity_entries WHERE welder_id = $1 AND process = 'SMAW' AND shop_id = $2 AND month = $3::date`,
        [welder.id, welder.homeShopId, `${month}-01`],
      );
      const version = cell?.version ?? null;
      return qa
        .put('/api/continuity/grid')
        .send({
          shopId: welder.homeShopId,
          month,
          cells: body.usedOn ? [{ welderId: welder.id, process: 'SMAW', usedOn: body.usedOn, jobReference: 'JOB-5120', version }] : [],
          remove: body.remove ? [{ welderId: welder.id, process: 'SMAW', version }] : [],
        })
        .expect(200);
    };
    const send = () => sendDueNotices(api.deps, { organizationIds: [w.org.id] });
    const mails = () => mailsTo(dir, w.qa.email);
    return { ...w, qa, wps, coupon, certify, grid, send, mails };
  }

  it('a new use after a warning: "back in continuity", with the new lapse date', async () => {
    const c = await company();
    const welder = c.weldersA[0]!;
    await c.certify((await c.coupon(welder, '2025-12-10')).id, '2025-12-11');
    await c.send();
    expect((await c.mails())[0]!.text).toContain('A-01 Ada Quenby · SMAW · ASME IX · lapses on 2026-06-10 (9 days left)');
    await c.grid(welder, '2026-05', { usedOn: '2026-05-15' });
    expect(await c.send()).toMatchObject({ emailsSent: 3 }); // foreman of shop A and both QA managers
    const [, second] = await c.mails();
    expect(second!.subject).toBe(`${c.org.name} lapse watch 2026-06-01: 1 back in continuity`);
    expect(second!.text).toContain('back in continuity after a correction of the records; now lapses on 2026-11-15');
  });

  it('a deleted use: supervisors told "4 days left" hear it has in fact been lapsed since April', async () => {
    const c = await company();
    const welder = c.weldersA[0]!;
    const coupon = await c.coupon(welder, '2025-10-01');
    await makeUse(api.ds, { org: c.org, shop: c.shopA, welder, process: 'SMAW', usedOn: '2025-12-05' });
    await c.certify(coupon.id, '2025-10-02');
    await c.send();
    expect((await c.mails())[0]!.text).toContain('lapses on 2026-06-05 (4 days left)');
    await c.grid(welder, '2025-12', { remove: true });
    await c.send();
    const [, second] = await c.mails();
    expect(second!.subject).toBe(`${c.org.name} lapse watch 2026-06-01: 1 lapsed`);
    expect(second!.text).toContain('lapsed on 2026-04-01 (61 days ago; last qualified day 2026-03-31)');
    // The foreman of the welder's shop heard it too; shop B's did not.
    expect(await mailsTo(dir, c.foreman.email)).toHaveLength(2);
    expect(await mailsTo(dir, c.foremanB.email)).toHaveLength(0);
  });

  it('a re-dated use: the lapse moves to today and is mailed as "lapsed today"', async () => {
    const c = await company();
    const welder = c.weldersA[0]!;
    const coupon = await c.coupon(welder, '2025-10-01');
    await makeUse(api.ds, { org: c.org, shop: c.shopA, welder, process: 'SMAW', usedOn: '2025-12-05' });
    await c.certify(coupon.id, '2025-10-02');
    await c.send();
    await c.grid(welder, '2025-12', { usedOn: '2025-12-01' });
    await c.send();
    const [, second] = await c.mails();
    expect(second!.text).toContain('lapsed on 2026-06-01 (today; last qualified day 2026-05-31)');
  });

  it('a corrected coupon: a test date typed wrong and put right moves the lapse into the 30-day warning', async () => {
    const c = await company();
    const welder = c.weldersA[0]!;
    await c.certify((await c.coupon(welder, '2025-12-20')).id, '2025-12-21');
    const second = await c.coupon(welder, '2026-05-25');
    await c.send();
    // The later coupon (2026-05-25) keeps the welder in continuity until 2026-11-25: no warning yet.
    expect(await c.mails()).toHaveLength(0);
    const corrected = await c.qa
      .patch(`/api/coupons/${second.id}`)
      .send({ ...couponBody({ welderId: welder.id, shopId: welder.homeShopId, procedureId: c.wps.id }, { testedOn: '2025-12-22' }), version: 1 });
    expect(corrected.status, JSON.stringify(corrected.body)).toBe(200);
    await c.send();
    const [mail] = await c.mails();
    expect(mail!.text).toContain('lapses on 2026-06-22 (21 days left)');
  });

  it('a revocation: the pending warning is dropped as superseded, nothing is mailed', async () => {
    const c = await company();
    const welder = c.weldersA[0]!;
    const q = await c.certify((await c.coupon(welder, '2025-12-20')).id, '2025-12-21');
    const pending = await api.ds.query<{ n: number }[]>(
      `SELECT count(*)::int AS n FROM notice_deliveries d JOIN lapse_notices n ON n.id = d.notice_id
        WHERE n.qualification_id = $1 AND d.status = 'pending'`,
      [q.id],
    );
    expect(pending[0]!.n).toBe(3);
    await c.qa.post(`/api/qualifications/${q.id}/revoke`).send({ revokedOn: '2026-05-30', reason: 'Bend test record found falsified' }).expect(200);
    expect(await c.send()).toMatchObject({ emailsSent: 0, superseded: 3 });
    expect(await c.mails()).toHaveLength(0);
    const rows = await api.ds.query<{ status: string; reason: string }[]>(
      `SELECT d.status, d.superseded_reason AS reason FROM notice_deliveries d JOIN lapse_notices n ON n.id = d.notice_id
        WHERE n.qualification_id = $1`,
      [q.id],
    );
    expect(rows).toEqual(Array(3).fill({ status: 'superseded', reason: 'The qualification was revoked on 2026-05-30' }));
  });

  it('a renewal: a new certified test moves the lapse away — the warning already sent is followed by "back in continuity", a pending one is dropped', async () => {
    const c = await company();
    const [a1, a2] = c.weldersA;
    await c.certify((await c.coupon(a1!, '2025-12-20')).id, '2025-12-21');
    await c.certify((await c.coupon(a2!, '2025-12-20')).id, '2025-12-21');
    // A-01's warning goes out; A-02's is still pending when A-02 is renewed.
    await api.ds.query(
      `UPDATE notice_deliveries d SET next_attempt_at = $2 FROM lapse_notices n, qualifications q
        WHERE n.id = d.notice_id AND q.id = n.qualification_id AND q.welder_id = $1`,
      [a2!.id, new Date('2026-06-01T13:00:00Z')],
    );
    await c.send();
    expect((await c.mails()).map((m) => m.text.includes('A-01') && !m.text.includes('A-02'))).toEqual([true]);
    await c.certify((await c.coupon(a1!, '2026-05-28')).id, '2026-05-29');
    await c.certify((await c.coupon(a2!, '2026-05-28')).id, '2026-05-29');
    clock.set('2026-06-01T13:30:00Z');
    await c.send();
    const mails = await c.mails();
    expect(mails).toHaveLength(2);
    expect(mails[1]!.text).toContain('A-01 Ada Quenby · SMAW · ASME IX · back in continuity after a correction of the records; now lapses on 2026-11-28');
    expect(mails[1]!.text).not.toContain('A-02');
    const a2rows = await api.ds.query<{ status: string; reason: string }[]>(
      `SELECT DISTINCT d.status, d.superseded_reason AS reason FROM notice_deliveries d
         JOIN lapse_notices n ON n.id = d.notice_id JOIN qualifications q ON q.id = n.qualification_id
        WHERE q.welder_id = $1`,
      [a2!.id],
    );
    expect(a2rows).toEqual([{ status: 'superseded', reason: 'The lapse date moved to 2026-11-28' }]);
    clock.set('2026-06-01T12:00:00Z');
  });
});
