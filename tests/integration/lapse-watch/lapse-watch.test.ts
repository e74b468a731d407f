// The lapse-watch job against the real PostgreSQL and a mail catcher started by this file on a free
// port with its own folder: outbox, digests, reruns, retries with backoff, the advisory lock, preview,
// run now, settings, roles and the command line.
import { spawn } from 'node:child_process';
import { Writable } from 'node:stream';
import { rm } from 'node:fs/promises';
import { pino } from 'pino';
import request from 'supertest';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import {
  addDays,
  addMonths,
  companySettingsSchema,
  lapseNoticeListSchema,
  lapseWatchPreviewSchema,
  lapseWatchRunListSchema,
  lapseWatchRunSchema,
  overviewSchema,
} from '@beadroll/rules';
import { startMailCatcher, type MailCatcher } from '../../../docker-free-scripts/mail-catcher.js';
import { repoRoot } from '../../../apps/api/src/config.js';
import { createDataSource } from '../../../apps/api/src/db/data-source.js';
import { createMailer } from '../../../apps/api/src/lib/mailer.js';
import { runDueLapseWatch, runLapseWatch } from '../../../apps/api/src/jobs/lapse-watch.job.js';
import type { LapseWatchDeps } from '../../../apps/api/src/lapse-watch/lapse-watch.service.js';
import {
  bodyOf,
  errorOf,
  signIn,
  startTestApi,
  testConfig,
  type TestApi,
} from '../../support/api-app.js';
import { TEST_PASSWORD } from '../../support/factories.js';
import { mailsTo, type CaughtMail } from '../../support/mail.js';
import { sendDueNotices } from '../../../apps/api/src/lapse-watch/lapse-sender.js';
import { serverTimeZone, todayIn } from '../../../apps/api/src/lib/dates.js';
import { freePort, mailFolder, makeLapseWorld, makeQualification, settableClock } from './lapse-factories.js';

const AS_OF = '2026-06-01';
const MIN = 60_000;

/**
 * The scenario of one company on 2026-06-01 with the default lead times 30 and 7 days:
 * A-01 SMAW lapses 06-20 (19 days: the 30-day warning), A-02 GTAW 06-05 (4 days: 30 and 7 crossed at once),
 * B-01 SMAW lapsed 05-25, B-02 SMAW 09-01 (outside every lead time), B-02 GTAW lapsed long ago (2025),
 * A-01 FCAW revoked, A-03 has left the company: those three are never reported.
 */
async function lapseScenario(api: TestApi) {
  const w = await makeLapseWorld(api.ds);
  const [a1, a2, a3] = w.weldersA;
  const [b1, b2] = w.weldersB;
  const q = (welder: typeof a1, over: Parameters<typeof makeQualification>[4]) =>
    makeQualification(api.ds, w.org, w.qa, welder!, over);
  const quals = {
    a1: await q(a1, { lapsesOn: '2026-06-20', lastEvidence: '2025-12-20' }),
    a2: await q(a2, { process: 'GTAW', lapsesOn: '2026-06-05', lastEvidence: '2025-12-05' }),
    b1: await q(b1, { lapsesOn: '2026-05-25', lastEvidence: '2025-11-25' }),
    b2: await q(b2, { lapsesOn: '2026-09-01', lastEvidence: '2026-03-01' }),
    b2old: await q(b2, { process: 'GTAW', lapsesOn: '2025-01-10', lastEvidence: '2024-07-10' }),
    a1revoked: await q(a1, {
      process: 'FCAW',
      lapsesOn: '2026-06-15',
      lastEvidence: '2025-12-15',
      revokedOn: '2026-04-01',
    }),
    a3left: await q(a3, { lapsesOn: '2026-06-10', lastEvidence: '2025-12-10' }),
  };
  return { ...w, quals };
}

const stampsIn = (mail: CaughtMail) => [...mail.text.matchAll(/^- ([A-Z0-9-]+) /gm)].map((m) => m[1]).sort();

async function noticeRows(api: TestApi, orgId: string) {
  return api.ds.query<{ threshold: string; lapsesOn: string; qualificationId: string }[]>(
    `SELECT threshold, to_char(lapses_on, 'YYYY-MM-DD') AS "lapsesOn", qualification_id AS "qualificationId"
       FROM lapse_notices WHERE organization_id = $1 ORDER BY lapses_on, threshold`,
    [orgId],
  );
}

async function deliveryRows(api: TestApi, orgId: string) {
  return api.ds.query<{ email: string; status: string; attempts: number; nextAttemptAt: Date | null }[]>(
    `SELECT d.email, d.status, d.attempts, d.next_attempt_at AS "nextAttemptAt"
       FROM notice_deliveries d JOIN lapse_notices n ON n.id = d.notice_id WHERE n.organization_id = $1`,
    [orgId],
  );
}

describe('lapse watch with the mail catcher', () => {
  let api: TestApi;
  let catcher: MailCatcher;
  let dir: string;
  let port: number;
  const clock = settableClock();
  beforeAll(async () => {
    dir = await mailFolder();
    port = await freePort();
    catcher = await startMailCatcher({ port, dir });
    const base = testConfig();
    api = await startTestApi({ clock, config: { smtp: { ...base.smtp, port }, mailDir: dir } });
  });
  afterAll(async () => {
    await api.close();
    await catcher.close();
    await rm(dir, { recursive: true, force: true });
  });

  /** A run on `asOf` (the clock is set to that day: a run can only be dated today). */
  const run = (orgId: string, asOf = AS_OF, deps: LapseWatchDeps = api.deps) => {
    if (clock.now().toISOString().slice(0, 10) !== asOf) clock.day(asOf);
    return runLapseWatch(deps, { trigger: 'manual', organizationIds: [orgId] });
  };
  /** One tick of the frequent sender for one company. */
  const send = (orgId: string, deps: LapseWatchDeps = api.deps) =>
    sendDueNotices(deps, { organizationIds: [orgId] });
  const runRow = async (id: string) =>
    (await api.ds.query<{ status: string; emailsSent: number; emailsFailed: number }[]>(
      `SELECT status, emails_sent AS "emailsSent", emails_failed AS "emailsFailed" FROM lapse_watch_runs WHERE id = $1`,
      [id],
    ))[0]!;

  it('sends one digest per recipient with the right welders, and a rerun sends nothing', async () => {
    const w = await lapseScenario(api);
    const [first] = await run(w.org.id);
    expect(first).toMatchObject({
      organizationId: w.org.id,
      asOf: AS_OF,
      status: 'done',
      noticesCreated: 4,
      emailsSent: 4,
      emailsFailed: 0,
    });

    expect((await noticeRows(api, w.org.id)).map((n) => [n.qualificationId, n.threshold])).toEqual([
      [w.quals.b1.id, 'lapsed'],
      [w.quals.a2.id, '30'],
      [w.quals.a2.id, '7'],
      [w.quals.a1.id, '30'],
    ]);

    // Foreman of the home shop A: only, A-02 once although it crossed two lead times.
    const [toForemanA] = await mailsTo(dir, w.foreman.email);
    expect(stampsIn(toForemanA!)).toEqual(['A-01', 'A-02']);
    expect(toForemanA!.subject).toBe(`${w.org.name} lapse watch ${AS_OF}: 2 lapsing`);
    expect(toForemanA!.text).toContain(
      'A-02 Bo Ferrand · GTAW · ASME IX · lapses on 2026-06-05 (4 days left)',
    );
    expect(toForemanA!.text).toContain('last logged use or test 2025-12-05');
    expect(toForemanA!.text).toContain(`${api.config.appUrl}/welders/${w.weldersA[1]!.id}`);
    expect(toForemanA!.html).toContain(`href="${api.config.appUrl}/welders/${w.weldersA[0]!.id}"`);
    expect(toForemanA!.html).toContain('<td>2026-06-20</td><td>19</td><td>2025-12-20</td>');
    // Foreman of shop B: the lapsed B-01 only.
    const [toForemanB] = await mailsTo(dir, w.foremanB.email);
    expect(stampsIn(toForemanB!)).toEqual(['B-01']);
    expect(toForemanB!.text).toContain('lapsed on 2026-05-25 (7 days ago; last qualified day 2026-05-24)');
    // Both QA managers: everything.
    for (const qa of [w.qa, w.qa2]) {
      const mails = await mailsTo(dir, qa.email);
      expect(mails).toHaveLength(1);
      expect(stampsIn(mails[0]!)).toEqual(['A-01', 'A-02', 'B-01']);
      expect(mails[0]!.subject).toBe(`${w.org.name} lapse watch ${AS_OF}: 2 lapsing, 1 lapsed`);
      expect(mails[0]!.text).toContain('the responsible inspector govern');
    }
    expect(await mailsTo(dir, w.welder.email)).toHaveLength(0);

    // Again, same day and the next: no new notice, no new mail.
    const [second] = await run(w.org.id);
    expect(second).toMatchObject({ status: 'done', noticesCreated: 0, emailsSent: 0 });
    const [nextDay] = await run(w.org.id, '2026-06-02');
    expect(nextDay).toMatchObject({ status: 'done', noticesCreated: 0, emailsSent: 0 });
    for (const u of [w.foreman, w.foremanB, w.qa, w.qa2]) expect(await mailsTo(dir, u.email)).toHaveLength(1);
    expect((await deliveryRows(api, w.org.id)).every((d) => d.status === 'sent' && d.attempts === 1)).toBe(
      true,
    );

    // On 06-14 A-01 is inside 7 days and A-02 has lapsed since the last run: one more digest to shop A's
    // foreman and the QA managers, none to shop B's.
    const [later] = await run(w.org.id, '2026-06-14');
    expect(later).toMatchObject({ noticesCreated: 2, emailsSent: 3 });
    const again = await mailsTo(dir, w.foreman.email);
    expect(again).toHaveLength(2);
    expect(stampsIn(again[1]!)).toEqual(['A-01', 'A-02']);
    expect(again[1]!.text).toContain('A-02 Bo Ferrand · GTAW · ASME IX · lapsed on 2026-06-05 (9 days ago');
    expect(await mailsTo(dir, w.foremanB.email)).toHaveLength(1);
  });

  it('defect 6: keeps notices pending while the mail server is down, retries within the day after the backoff, and the run is done only then', async () => {
    const downPort = await freePort();
    const downDir = await mailFolder();
    const base = testConfig();
    const deps: LapseWatchDeps = { ...api.deps, mailer: createMailer({ ...base.smtp, port: downPort }) };
    const w = await lapseScenario(api);
    try {
      const [failed] = await run(w.org.id, AS_OF, deps);
      // Nothing could be sent: the run is not done, it waits for its retries.
      expect(failed).toMatchObject({ status: 'sending', noticesCreated: 4, emailsSent: 0, emailsFailed: 0 });
      const pending = await deliveryRows(api, w.org.id);
      // A-01 and A-02 (two notices) to foreman A and both QA managers; B-01 to foreman B and both QA managers.
      expect(pending).toHaveLength(12);
      expect(pending.every((d) => d.status === 'pending' && d.attempts === 1)).toBe(true);
      const firstRetry = clock.now().getTime() + 15 * MIN;
      for (const d of pending) expect(Math.abs(d.nextAttemptAt!.getTime() - firstRetry)).toBeLessThan(MIN);

      const down = await startMailCatcher({ port: downPort, dir: downDir });
      try {
        // Back up, but the backoff has not passed: the sender sends nothing yet.
        expect(await send(w.org.id, deps)).toMatchObject({ emailsSent: 0, emailsFailed: 0 });
        expect(await mailsTo(downDir, w.qa.email)).toHaveLength(0);

        // Within the same day, 16 minutes later, the frequent sender retries — no daily run needed.
        clock.advance(16 * MIN);
        expect(await send(w.org.id, deps)).toMatchObject({ emailsSent: 4, emailsFailed: 0 });
        expect(await runRow(failed!.id)).toEqual({ status: 'done', emailsSent: 4, emailsFailed: 0 });
        clock.advance(60 * MIN);
        expect(await send(w.org.id, deps)).toMatchObject({ emailsSent: 0 });
        for (const u of [w.foreman, w.foremanB, w.qa, w.qa2])
          expect(await mailsTo(downDir, u.email)).toHaveLength(1);
        expect(stampsIn((await mailsTo(downDir, w.qa.email))[0]!)).toEqual(['A-01', 'A-02', 'B-01']);
        const sent = await api.ds.query<{ status: string; attempts: number; messageId: string | null }[]>(
          `SELECT d.status, d.attempts, d.message_id AS "messageId"
             FROM notice_deliveries d JOIN lapse_notices n ON n.id = d.notice_id WHERE n.organization_id = $1`,
          [w.org.id],
        );
        expect(sent.every((d) => d.status === 'sent' && d.attempts === 2 && /^<.+@.+>$/.test(d.messageId ?? ''))).toBe(true);
      } finally {
        await down.close();
      }
    } finally {
      deps.mailer.close();
      await rm(downDir, { recursive: true, force: true });
    }
  });

  it('gives a delivery up after five failed sends and shows it on the Overview', async () => {
    const deps: LapseWatchDeps = {
      ...api.deps,
      mailer: createMailer({ ...testConfig().smtp, port: await freePort() }),
    };
    const w = await makeLapseWorld(api.ds);
    await makeQualification(api.ds, w.org, w.qa, w.weldersB[0]!, {
      lapsesOn: '2026-06-10',
      lastEvidence: '2025-12-10',
    });
    try {
      const backoffs: number[] = [];
      clock.day(AS_OF);
      const [r] = await run(w.org.id, AS_OF, deps);
      for (let attempt = 1; attempt <= 5; attempt++) {
        const before = clock.now().getTime();
        if (attempt > 1) expect(await send(w.org.id, deps)).toMatchObject({ emailsSent: 0, emailsFailed: 3 });
        expect(await runRow(r!.id)).toMatchObject({ status: attempt < 5 ? 'sending' : 'done' });
        const rows = await deliveryRows(api, w.org.id);
        expect(rows.every((d) => d.attempts === attempt)).toBe(true);
        if (attempt < 5) backoffs.push(Math.round((rows[0]!.nextAttemptAt!.getTime() - before) / MIN));
        clock.advance(5 * 60 * MIN);
      }
      expect(backoffs).toEqual([15, 30, 60, 120]);
      const rows = await deliveryRows(api, w.org.id);
      expect(rows.map((d) => d.status)).toEqual(['failed', 'failed', 'failed']);
      expect(await runRow(r!.id)).toEqual({ status: 'done', emailsSent: 0, emailsFailed: 3 });
      expect(await send(w.org.id, deps)).toMatchObject({ emailsSent: 0, emailsFailed: 0 });

      const qa = await signIn(api.app, w.qa.email, TEST_PASSWORD);
      const overview = bodyOf(overviewSchema, await qa.get('/api/overview'));
      expect(overview.failedDeliveries).toBe(3);
      expect(overview.latestRun).toMatchObject({ id: r!.id, status: 'done', emailsFailed: 3 });
      const failed = bodyOf(lapseNoticeListSchema, await qa.get('/api/lapse-watch/notices?status=failed'));
      expect(failed.items).toHaveLength(1);
      expect(failed.items[0]!.deliveries.map((d) => [d.status, d.attempts])).toEqual([
        ['failed', 5],
        ['failed', 5],
        ['failed', 5],
      ]);
      expect(failed.items[0]!.deliveries[0]!.lastError).toMatch(/ECONNREFUSED|connect/i);
      // A foreman sees only their own given-up deliveries.
      const foremanB = await signIn(api.app, w.foremanB.email, TEST_PASSWORD);
      expect(bodyOf(overviewSchema, await foremanB.get('/api/overview')).failedDeliveries).toBe(1);
    } finally {
      deps.mailer.close();
    }
  });

  it('lets only one of two runs started at the same moment work; the other records and logs a skip', async () => {
    const w = await lapseScenario(api);
    const logLines: string[] = [];
    const sink = new Writable({
      write(chunk: Buffer, _enc, done) {
        logLines.push(chunk.toString());
        done();
      },
    });
    const instances = await Promise.all(
      ['east', 'west'].map(async (name) => {
        const ds = createDataSource(api.config.db, { poolSize: 3 });
        await ds.initialize();
        const deps: LapseWatchDeps = {
          ...api.deps,
          dataSource: ds,
          mailer: createMailer(api.config.smtp),
          logger: pino({ level: 'warn', base: { instance: name } }, sink),
        };
        return { name, ds, deps };
      }),
    );
    try {
      clock.day(AS_OF);
      const results = await Promise.all(
        instances.map((i) =>
          runLapseWatch(i.deps, {
            asOf: AS_OF,
            trigger: 'schedule',
            organizationIds: [w.org.id],
            instance: i.name,
          }),
        ),
      );
      const runs = results.flat();
      expect(runs.map((r) => r.status).sort()).toEqual(['done', 'skipped']);
      const done = runs.find((r) => r.status === 'done')!;
      const skipped = runs.find((r) => r.status === 'skipped')!;
      expect(done).toMatchObject({ noticesCreated: 4, emailsSent: 4 });
      expect(skipped).toMatchObject({ organizationId: w.org.id, noticesCreated: 0, emailsSent: 0 });
      expect(skipped).not.toHaveProperty('instance');
      expect(logLines.join('')).toContain('lapse watch skipped: another instance holds the lock');
      for (const u of [w.foreman, w.foremanB, w.qa, w.qa2])
        expect(await mailsTo(dir, u.email)).toHaveLength(1);
      expect(await noticeRows(api, w.org.id)).toHaveLength(4);
    } finally {
      for (const i of instances) {
        i.deps.mailer.close();
        await i.ds.destroy();
      }
    }
  });

  it("runs a company's scheduled day once: an instance that found it due just before another ran it runs nothing", async () => {
    const w = await lapseScenario(api);
    clock.day(AS_OF);
    const at = clock.now();
    // The late instance has decided the day is due and stops just before taking the lock, until the
    // early instance has run the day from start to end.
    const ds = api.deps.dataSource;
    let reachedLock!: () => void;
    const atLock = new Promise<void>((r) => (reachedLock = r));
    let openGate!: () => void;
    const gate = new Promise<void>((r) => (openGate = r));
    const lateDataSource = new Proxy(ds, {
      get(target, prop) {
        if (prop === 'createQueryRunner')
          return () => {
            const runner = target.createQueryRunner();
            const connect = runner.connect.bind(runner);
            runner.connect = async (): Promise<unknown> => {
              reachedLock();
              await gate;
              return (await connect()) as unknown;
            };
            return runner;
          };
        const value: unknown = Reflect.get(target, prop, target);
        return typeof value === 'function' ? (value as (...a: unknown[]) => unknown).bind(target) : value;
      },
    });
    const late = runDueLapseWatch({ ...api.deps, dataSource: lateDataSource }, at, [w.org.id]);
    await atLock;
    const early = await runDueLapseWatch(api.deps, at, [w.org.id]);
    expect(early.map((r) => [r.status, r.noticesCreated])).toEqual([['done', 4]]);
    openGate();
    expect(await late).toEqual([]);
    const runs = await api.ds.query<{ status: string; trigger: string }[]>(
      `SELECT status, trigger FROM lapse_watch_runs WHERE organization_id = $1`,
      [w.org.id],
    );
    expect(runs).toEqual([{ status: 'done', trigger: 'schedule' }]);
    for (const u of [w.foreman, w.foremanB, w.qa, w.qa2]) expect(await mailsTo(dir, u.email)).toHaveLength(1);
  });

  it('previews what a run would send without sending or writing anything', async () => {
    const w = await lapseScenario(api);
    const qa = await signIn(api.app, w.qa.email, TEST_PASSWORD);
    const res = await qa.get(`/api/lapse-watch/preview?asOf=${AS_OF}`);
    expect(res.status).toBe(200);
    const preview = bodyOf(lapseWatchPreviewSchema, res);
    expect(preview.asOf).toBe(AS_OF);
    expect(
      preview.notices.map((n) => [n.welder.stamp, n.process, n.threshold, n.lapsesOn, n.daysLeft]),
    ).toEqual([
      ['B-01', 'SMAW', 'lapsed', '2026-05-25', -7],
      ['A-02', 'GTAW', '30', '2026-06-05', 4],
      ['A-02', 'GTAW', '7', '2026-06-05', 4],
      ['A-01', 'SMAW', '30', '2026-06-20', 19],
    ]);
    const a1 = preview.notices.find((n) => n.welder.stamp === 'A-01')!;
    expect(a1.lastUse).toBe('2025-12-20');
    expect(a1.recipients.map((r) => r.email).sort()).toEqual(
      [w.foreman.email, w.qa.email, w.qa2.email].sort(),
    );

    expect(await noticeRows(api, w.org.id)).toHaveLength(0);
    const [runs] = await api.ds.query<{ n: number }[]>(
      `SELECT count(*)::int AS n FROM lapse_watch_runs WHERE organization_id = $1`,
      [w.org.id],
    );
    expect(runs?.n).toBe(0);
    await new Promise((r) => setTimeout(r, 300));
    for (const u of [w.foreman, w.foremanB, w.qa, w.qa2]) expect(await mailsTo(dir, u.email)).toHaveLength(0);

    // "Run now" through the API sends it; a preview afterwards has nothing left to send.
    clock.day(AS_OF);
    const runRes = await qa.post('/api/lapse-watch/runs').send({ asOf: AS_OF });
    expect(runRes.status).toBe(201);
    const manual = bodyOf(lapseWatchRunSchema, runRes);
    expect(manual).toMatchObject({ trigger: 'manual', status: 'done', noticesCreated: 4, emailsSent: 4 });
    expect(
      bodyOf(lapseWatchPreviewSchema, await qa.get(`/api/lapse-watch/preview?asOf=${AS_OF}`)).notices,
    ).toEqual([]);
    const history = bodyOf(lapseWatchRunListSchema, await qa.get('/api/lapse-watch/runs'));
    expect(history.items[0]).toMatchObject({ id: manual.id, emailsSent: 4 });
    expect(history.items.every((r) => r.organizationId === w.org.id)).toBe(true);
    const notices = bodyOf(lapseNoticeListSchema, await qa.get('/api/lapse-watch/notices'));
    expect(notices.items).toHaveLength(4);
    const b1 = notices.items.find((n) => n.welder.stamp === 'B-01')!;
    expect(b1.deliveries.map((d) => d.email).sort()).toEqual(
      [w.foremanB.email, w.qa.email, w.qa2.email].sort(),
    );
    expect(b1.deliveries.every((d) => d.status === 'sent' && d.sentAt !== null)).toBe(true);
    expect(
      bodyOf(lapseNoticeListSchema, await qa.get('/api/lapse-watch/notices?status=pending')).items,
    ).toEqual([]);
  });

  it('refuses a bad preview date, run date or notice status with 400 and the field', async () => {
    const w = await makeLapseWorld(api.ds);
    const qa = await signIn(api.app, w.qa.email, TEST_PASSWORD);
    expect(errorOf(await qa.get('/api/lapse-watch/preview?asOf=2026-02-30')).fields).toHaveProperty('asOf');
    const bad = await qa.post('/api/lapse-watch/runs').send({ asOf: '01/06/2026' });
    expect(bad.status).toBe(400);
    expect(errorOf(bad).fields).toHaveProperty('asOf');
    expect(errorOf(await qa.get('/api/lapse-watch/notices?status=lost')).fields).toHaveProperty('status');
    const [runs] = await api.ds.query<{ n: number }[]>(
      `SELECT count(*)::int AS n FROM lapse_watch_runs WHERE organization_id = $1`,
      [w.org.id],
    );
    expect(runs?.n).toBe(0);
  });

  it('runs on schedule once a day, when the company time has come', async () => {
    const w = await lapseScenario(api);
    const late = await makeLapseWorld(api.ds);
    const lateQa = await signIn(api.app, late.qa.email, TEST_PASSWORD);
    expect((await lateQa.patch('/api/settings').send({ lapseWatchTime: '23:00' })).status).toBe(200);
    const among = [w.org.id, late.org.id];
    const at = (d: number, h: number, m: number) => new Date(2026, 5, d, h, m); // server time zone

    expect(await runDueLapseWatch(api.deps, at(1, 5, 59), among)).toEqual([]);
    const due = await runDueLapseWatch(api.deps, at(1, 6, 0), among);
    expect(due.map((r) => [r.organizationId, r.trigger, r.status, r.asOf])).toEqual([
      [w.org.id, 'schedule', 'done', '2026-06-01'],
    ]);
    expect(await mailsTo(dir, w.qa.email)).toHaveLength(1);
    // Later the same day nothing is due; the late company's time comes at 23:00; the next morning again.
    expect(await runDueLapseWatch(api.deps, at(1, 12, 0), among)).toEqual([]);
    expect((await runDueLapseWatch(api.deps, at(1, 23, 0), among)).map((r) => r.organizationId)).toEqual([
      late.org.id,
    ]);
    expect((await runDueLapseWatch(api.deps, at(2, 6, 1), among)).map((r) => r.organizationId)).toEqual([
      w.org.id,
    ]);
  });

  it('uses the lead times of the company settings', async () => {
    const w = await makeLapseWorld(api.ds);
    const q = await makeQualification(api.ds, w.org, w.qa, w.weldersA[0]!, {
      lapsesOn: '2026-07-16',
      lastEvidence: '2026-01-16',
    });
    const qa = await signIn(api.app, w.qa.email, TEST_PASSWORD);
    expect(
      bodyOf(lapseWatchPreviewSchema, await qa.get(`/api/lapse-watch/preview?asOf=${AS_OF}`)).notices,
    ).toEqual([]);
    expect((await qa.patch('/api/settings').send({ warnDays: [14, 60] })).status).toBe(200);
    const [r] = await run(w.org.id);
    expect(r).toMatchObject({ noticesCreated: 1, emailsSent: 3 }); // foreman of shop A and both QA managers
    expect((await noticeRows(api, w.org.id)).map((n) => [n.qualificationId, n.threshold])).toEqual([
      [q.id, '60'],
    ]);
  });
});

describe('/api/settings and the roles of lapse watch', () => {
  let api: TestApi;
  beforeAll(async () => {
    api = await startTestApi();
  });
  afterAll(() => api.close());

  it('reads the defaults, saves a change, and refuses bad values with 400 naming each field', async () => {
    const w = await makeLapseWorld(api.ds);
    const qa = await signIn(api.app, w.qa.email, TEST_PASSWORD);
    const zone = serverTimeZone();
    expect(bodyOf(companySettingsSchema, await qa.get('/api/settings'))).toEqual({
      warnDays: [30, 7],
      closedMonthAfter: 2,
      lapseWatchTime: '06:00',
      timeZone: zone,
      timeZoneIsServerDefault: true,
      serverTimeZone: zone,
      today: todayIn(zone, new Date()),
      updatedAt: null,
    });
    const saved = await qa.patch('/api/settings').send({ warnDays: [7, 45], lapseWatchTime: '05:30' });
    expect(saved.status).toBe(200);
    expect(bodyOf(companySettingsSchema, saved)).toMatchObject({
      warnDays: [45, 7],
      closedMonthAfter: 2,
      lapseWatchTime: '05:30',
    });
    const audit = await api.ds.query<{ action: string; before: unknown; after: unknown }[]>(
      `SELECT action, before, after FROM audit_events WHERE organization_id = $1 AND entity_type = 'company-settings'`,
      [w.org.id],
    );
    expect(audit).toEqual([
      {
        action: 'company-settings.updated',
        before: { warnDays: [30, 7], lapseWatchTime: '06:00' },
        after: { warnDays: [45, 7], lapseWatchTime: '05:30' },
      },
    ]);

    const bad = await qa
      .patch('/api/settings')
      .send({ warnDays: [0, 200], closedMonthAfter: 13, lapseWatchTime: '25:00' });
    expect(bad.status).toBe(400);
    expect(Object.keys(errorOf(bad).fields ?? {}).sort()).toEqual([
      'closedMonthAfter',
      'lapseWatchTime',
      'warnDays.0',
      'warnDays.1',
    ]);
    for (const body of [
      { warnDays: [] },
      { warnDays: [1, 2, 3, 4, 5] },
      { warnDays: [7, 7] },
      { warnDays: [1.5] },
      { closedMonthAfter: 'two' },
      { unknown: 1 },
    ]) {
      const res = await qa.patch('/api/settings').send(body);
      expect(res.status, JSON.stringify(body)).toBe(400);
      expect(Object.keys(errorOf(res).fields ?? {})).not.toHaveLength(0);
    }
    expect(bodyOf(companySettingsSchema, await qa.get('/api/settings'))).toMatchObject({
      warnDays: [45, 7],
      lapseWatchTime: '05:30',
    });
    // Another company still runs on its own (default) settings.
    const other = await makeLapseWorld(api.ds);
    const otherQa = await signIn(api.app, other.qa.email, TEST_PASSWORD);
    expect(bodyOf(companySettingsSchema, await otherQa.get('/api/settings')).warnDays).toEqual([30, 7]);
  });

  it('answers 403 to foremen and welders on settings, preview, runs and notices, and 401 without a sign-in', async () => {
    const w = await makeLapseWorld(api.ds);
    for (const user of [w.foreman, w.welder]) {
      const agent = await signIn(api.app, user.email, TEST_PASSWORD);
      const calls = [
        agent.get('/api/settings'),
        agent.patch('/api/settings').send({ closedMonthAfter: 3 }),
        agent.get(`/api/lapse-watch/preview?asOf=${AS_OF}`),
        agent.get('/api/lapse-watch/runs'),
        agent.post('/api/lapse-watch/runs').send({}),
        agent.get('/api/lapse-watch/notices'),
      ];
      for (const res of await Promise.all(calls)) {
        expect(res.status).toBe(403);
        expect(errorOf(res).code).toBe('forbidden');
      }
    }
    expect((await request(api.app).get('/api/settings')).status).toBe(401);
    expect((await request(api.app).post('/api/lapse-watch/runs').send({})).status).toBe(401);
    const [settingsRows] = await api.ds.query<{ n: number }[]>(
      `SELECT count(*)::int AS n FROM company_settings WHERE organization_id = $1`,
      [w.org.id],
    );
    expect(settingsRows?.n).toBe(0);
  });
});

describe('npm run lapse-watch', () => {
  let catcher: MailCatcher;
  let dir: string;
  let port: number;
  let api: TestApi;
  beforeAll(async () => {
    dir = await mailFolder();
    port = await freePort();
    catcher = await startMailCatcher({ port, dir });
    api = await startTestApi();
  });
  afterAll(async () => {
    await api.close();
    await catcher.close();
    await rm(dir, { recursive: true, force: true });
  });

  const cli = (args: string[], env: Record<string, string> = {}) =>
    new Promise<{ code: number | null; out: string }>((resolve, reject) => {
      const out: string[] = [];
      const child = spawn('npm', ['run', '--silent', 'lapse-watch', '--', ...args], {
        cwd: repoRoot,
        env: { ...process.env, NODE_ENV: 'test', SMTP_PORT: String(port), LOG_LEVEL: 'silent', ...env },
        stdio: ['ignore', 'pipe', 'pipe'],
      });
      child.stdout.on('data', (c: Buffer) => out.push(c.toString()));
      child.stderr.on('data', (c: Buffer) => out.push(c.toString()));
      child.once('error', reject);
      child.once('exit', (code) => resolve({ code, out: out.join('') }));
    });

  it('runs once for today, sends the digests and exits 0', { timeout: 180_000 }, async () => {
    const w = await makeLapseWorld(api.ds);
    const today = todayIn(serverTimeZone(), new Date());
    await makeQualification(api.ds, w.org, w.qa, w.weldersA[0]!, {
      lapsesOn: addDays(today, 5),
      lastEvidence: addMonths(addDays(today, 5), -6),
    });
    const { code, out } = await cli([]);
    expect(code, out).toBe(0);
    expect(out).toContain(`lapse watch ${today} done company ${w.org.id}: 2 notices, 3 e-mails sent, 0 failed`);
    const [cliRun] = await api.ds.query<{ trigger: string; status: string; asOf: string }[]>(
      `SELECT trigger, status, to_char(as_of, 'YYYY-MM-DD') AS "asOf" FROM lapse_watch_runs WHERE organization_id = $1`,
      [w.org.id],
    );
    expect(cliRun).toEqual({ trigger: 'cli', status: 'done', asOf: today });
    const [mail] = await mailsTo(dir, w.qa.email);
    expect(stampsIn(mail!)).toEqual(['A-01']);
  });

  it('defect 5: refuses a run dated any other day than today, and a date that is not YYYY-MM-DD', { timeout: 180_000 }, async () => {
    const today = todayIn(serverTimeZone(), new Date());
    const { code, out } = await cli(['--as-of', addDays(today, 30)]);
    expect(code, out).toBe(2);
    expect(out).toContain(`A run can only be dated today: ${today}`);
    expect((await cli(['--as-of', '2026-13-01'])).code).toBe(2);
  });
});
