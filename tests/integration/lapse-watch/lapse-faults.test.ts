// Faults of the lapse-watch sender (defect 6), with the real PostgreSQL and real SMTP servers: the mail
// server refusing, the mail server accepting and the database then failing to record it, a sender dying
// between its claim and its send, and two API instances sending at once. Nothing is lost, the only
// duplicate is the documented one (accepted by SMTP, not recorded), and the run history stays true.
import { rm } from 'node:fs/promises';
import { SMTPServer } from 'smtp-server';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { startMailCatcher, type MailCatcher } from '../../../docker-free-scripts/mail-catcher.js';
import { createDataSource } from '../../../apps/api/src/db/data-source.js';
import { createMailer, type Mailer } from '../../../apps/api/src/lib/mailer.js';
import { runLapseWatch, runSenderTick } from '../../../apps/api/src/jobs/lapse-watch.job.js';
import { CLAIM_LEASE_MS, sendDueNotices } from '../../../apps/api/src/lapse-watch/lapse-sender.js';
import type { LapseWatchDeps } from '../../../apps/api/src/lapse-watch/lapse-watch.service.js';
import { startTestApi, testConfig, type TestApi } from '../../support/api-app.js';
import { startTcpProxy } from '../../support/api-tcp-proxy.js';
import { mailsTo } from '../../support/mail.js';
import { freePort, mailFolder, makeLapseWorld, makeQualification, settableClock } from './lapse-factories.js';

const MIN = 60_000;

describe('lapse-watch sender faults', () => {
  let api: TestApi;
  let catcher: MailCatcher;
  let dir: string;
  let port: number;
  const clock = settableClock('2026-06-01T12:00:00Z');
  beforeAll(async () => {
    dir = await mailFolder();
    port = await freePort();
    catcher = await startMailCatcher({ port, dir });
    api = await startTestApi({ clock, config: { smtp: { ...testConfig().smtp, port } } });
  });
  afterAll(async () => {
    await api.close();
    await catcher.close();
    await rm(dir, { recursive: true, force: true });
  });

  /** A company whose B-01 lapses in 19 days: one notice, three recipients (shop B's foreman, two QA managers). */
  async function oneNotice() {
    clock.set('2026-06-01T12:00:00Z');
    const w = await makeLapseWorld(api.ds);
    await makeQualification(api.ds, w.org, w.qa, w.weldersB[0]!, { lapsesOn: '2026-06-20', lastEvidence: '2025-12-20' });
    const recipients = [w.foremanB, w.qa, w.qa2];
    return { w, recipients };
  }
  const deliveries = (orgId: string) =>
    api.ds.query<{ email: string; status: string; attempts: number; lastError: string | null; messageId: string | null }[]>(
      `SELECT d.email, d.status, d.attempts, d.last_error AS "lastError", d.message_id AS "messageId"
         FROM notice_deliveries d JOIN lapse_notices n ON n.id = d.notice_id WHERE n.organization_id = $1 ORDER BY d.email`,
      [orgId],
    );
  const runOf = async (id: string) =>
    (await api.ds.query<{ status: string; emailsSent: number; emailsFailed: number }[]>(
      `SELECT status, emails_sent AS "emailsSent", emails_failed AS "emailsFailed" FROM lapse_watch_runs WHERE id = $1`,
      [id],
    ))[0];
  const countMails = async (emails: string[]) => Promise.all(emails.map(async (e) => (await mailsTo(dir, e)).length));

  it('an SMTP server refusing every recipient: deliveries stay pending with the refusal, retried after 15 minutes, sent once when it accepts', async () => {
    const { w, recipients } = await oneNotice();
    const refusing = new SMTPServer({
      authOptional: true,
      disabledCommands: ['STARTTLS'],
      logger: false,
      onRcptTo(_address, _session, callback) {
        const err = Object.assign(new Error('Mailbox unavailable (refused by policy)'), { responseCode: 550 });
        callback(err);
      },
    });
    const refusingPort = await freePort();
    await new Promise<void>((resolve) => refusing.listen(refusingPort, '127.0.0.1', resolve));
    const refusingMailer = createMailer({ ...testConfig().smtp, port: refusingPort });
    try {
      const [run] = await runLapseWatch({ ...api.deps, mailer: refusingMailer }, { trigger: 'manual', organizationIds: [w.org.id] });
      expect(run).toMatchObject({ status: 'sending', noticesCreated: 1, emailsSent: 0 });
      const rows = await deliveries(w.org.id);
      expect(rows).toHaveLength(3);
      for (const d of rows) {
        expect(d).toMatchObject({ status: 'pending', attempts: 1, messageId: null });
        expect(d.lastError).toMatch(/550|refused/i);
      }
      // Still refusing 16 minutes later: the second attempt fails too, backing off 30 minutes.
      clock.advance(16 * MIN);
      expect(await sendDueNotices({ ...api.deps, mailer: refusingMailer }, { organizationIds: [w.org.id] })).toMatchObject({ emailsFailed: 3 });
      // Now the relay accepts: after the backoff each recipient gets one digest, and the run is done.
      clock.advance(31 * MIN);
      expect(await sendDueNotices(api.deps, { organizationIds: [w.org.id] })).toMatchObject({ emailsSent: 3 });
      expect(await countMails(recipients.map((r) => r.email))).toEqual([1, 1, 1]);
      expect((await deliveries(w.org.id)).every((d) => d.status === 'sent' && d.attempts === 3)).toBe(true);
      expect(await runOf(run!.id)).toEqual({ status: 'done', emailsSent: 3, emailsFailed: 0 });
    } finally {
      refusingMailer.close();
      await new Promise<void>((resolve) => refusing.close(() => resolve()));
    }
  });

  it('SMTP accepts and the database then fails to record it: that one digest goes twice (the documented duplicate), nothing is lost', async () => {
    const { w, recipients } = await oneNotice();
    // Written, not yet sent.
    const [run] = await runLapseWatch({ ...api.deps, mailer: brokenMailer() }, { trigger: 'manual', organizationIds: [w.org.id] });
    clock.advance(16 * MIN);
    // A sender whose database goes away the instant the SMTP server has accepted its first digest.
    const proxy = await startTcpProxy({ host: api.config.db.host, port: api.config.db.port });
    const ds = createDataSource({ ...api.config.db, port: proxy.port }, { poolSize: 2 });
    await ds.initialize();
    const real = createMailer(api.config.smtp);
    let accepted = 0;
    const cutAfterAccept: Mailer = {
      async send(mail) {
        const sent = await real.send(mail);
        accepted++;
        await proxy.cut();
        return sent;
      },
      close: () => real.close(),
    };
    try {
      await expect(
        sendDueNotices({ ...api.deps, dataSource: ds, mailer: cutAfterAccept }, { organizationIds: [w.org.id] }),
      ).rejects.toThrow();
      expect(accepted).toBe(1);
      const first = (await countMails(recipients.map((r) => r.email))).indexOf(1);
      expect(first).toBeGreaterThanOrEqual(0);
      expect((await deliveries(w.org.id)).every((d) => d.status === 'pending')).toBe(true);
      // Another sender right away: the other two recipients, not the one whose claim is still held.
      expect(await sendDueNotices(api.deps, { organizationIds: [w.org.id] })).toMatchObject({ emailsSent: 2 });
      expect(await countMails(recipients.map((r) => r.email))).toEqual([1, 1, 1]);
      // Once the claim runs out, the unrecorded one goes again: one duplicate, and everything recorded sent.
      clock.advance(CLAIM_LEASE_MS + 1000);
      expect(await sendDueNotices(api.deps, { organizationIds: [w.org.id] })).toMatchObject({ emailsSent: 1 });
      const counts = await countMails(recipients.map((r) => r.email));
      expect(counts.reduce((a, b) => a + b)).toBe(4);
      expect(counts[first]).toBe(2);
      expect((await deliveries(w.org.id)).every((d) => d.status === 'sent' && /^<.+>$/.test(d.messageId ?? ''))).toBe(true);
      expect(await runOf(run!.id)).toEqual({ status: 'done', emailsSent: 3, emailsFailed: 0 });
    } finally {
      cutAfterAccept.close();
      await ds.destroy().catch(() => undefined);
      await proxy.cut();
    }
  });

  it('a sender that dies between its claim and its send: nothing is sent twice, another sender takes over when the claim runs out', async () => {
    const { w, recipients } = await oneNotice();
    const [run] = await runLapseWatch({ ...api.deps, mailer: brokenMailer() }, { trigger: 'manual', organizationIds: [w.org.id] });
    clock.advance(16 * MIN);
    const died = new Error('process killed');
    await expect(
      sendDueNotices(api.deps, {
        organizationIds: [w.org.id],
        afterClaim: () => Promise.reject(died),
      }),
    ).rejects.toBe(died);
    // The abandoned claim holds the first recipient; the others are sent by the next sender.
    expect(await sendDueNotices(api.deps, { organizationIds: [w.org.id] })).toMatchObject({ emailsSent: 2 });
    expect(await runOf(run!.id)).toMatchObject({ status: 'sending' });
    clock.advance(CLAIM_LEASE_MS + 1000);
    expect(await sendDueNotices(api.deps, { organizationIds: [w.org.id] })).toMatchObject({ emailsSent: 1 });
    expect(await countMails(recipients.map((r) => r.email))).toEqual([1, 1, 1]);
    expect(await runOf(run!.id)).toEqual({ status: 'done', emailsSent: 3, emailsFailed: 0 });
  });

  it('two API instances sending at once (each its own pool and mailer): every digest once, the run history true', async () => {
    clock.set('2026-06-01T12:00:00Z');
    const w = await makeLapseWorld(api.ds);
    const welders = [...w.weldersA.slice(0, 2), ...w.weldersB];
    for (const [i, welder] of welders.entries())
      await makeQualification(api.ds, w.org, w.qa, welder, { lapsesOn: `2026-06-${String(10 + i).padStart(2, '0')}`, lastEvidence: `2025-12-${String(10 + i).padStart(2, '0')}` });
    const [run] = await runLapseWatch({ ...api.deps, mailer: brokenMailer() }, { trigger: 'manual', organizationIds: [w.org.id] });
    clock.advance(16 * MIN);
    const other = await startTestApi({ clock, config: { smtp: { ...testConfig().smtp, port } } });
    try {
      const deps: LapseWatchDeps[] = [api.deps, other.deps];
      // Without the sender lock (claims alone must keep them apart), several rounds at once...
      const only = { organizationIds: [w.org.id] };
      const outcomes = await Promise.all(deps.flatMap((d) => [sendDueNotices(d, only), sendDueNotices(d, only)]));
      // ...and the scheduled tick, whose lock lets one instance through at a time.
      const ticks = await Promise.all(deps.map((d) => runSenderTick(d, only)));
      const sent = outcomes.reduce((n, o) => n + o.emailsSent, 0) + ticks.reduce((n, t) => n + (t?.emailsSent ?? 0), 0);
      const recipients = [w.foreman, w.foremanB, w.qa, w.qa2];
      expect(await countMails(recipients.map((r) => r.email))).toEqual([1, 1, 1, 1]);
      expect(sent).toBe(4);
      expect(outcomes.every((o) => o.lostClaims === 0)).toBe(true);
      expect((await deliveries(w.org.id)).every((d) => d.status === 'sent' && d.attempts === 2)).toBe(true);
      expect(await runOf(run!.id)).toEqual({ status: 'done', emailsSent: 4, emailsFailed: 0 });
    } finally {
      await other.close();
    }
  });

  /** A mailer whose every send fails (a first run whose mail cannot go out, so the test controls the sending). */
  function brokenMailer(): Mailer {
    return {
      send: () => Promise.reject(new Error('connect ECONNREFUSED 127.0.0.1:1')),
      close: () => undefined,
    };
  }
});
