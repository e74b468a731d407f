// A company's own clock (defect 4) and runs dated only today (defect 5), with TZ set on the API process
// to America/Chicago and to Australia/Sydney: the day of a run, its schedule, the day counts of the mail,
// the verify page and the Settings page all follow the company's time zone, never the UTC date.
import { rm } from 'node:fs/promises';
import { afterAll, afterEach, beforeAll, describe, expect, it } from 'vitest';
import { companySettingsSchema, gridSchema, lapseWatchPreviewSchema, meSchema, qualificationSchema, verifySchema } from '@beadroll/rules';
import { startMailCatcher, type MailCatcher } from '../../../docker-free-scripts/mail-catcher.js';
import { runDueLapseWatch } from '../../../apps/api/src/jobs/lapse-watch.job.js';
import { serverTimeZone, todayIn, wallTimeIn } from '../../../apps/api/src/lib/dates.js';
import { bodyOf, errorOf, signIn, startTestApi, testConfig, type TestApi } from '../../support/api-app.js';
import { TEST_PASSWORD } from '../../support/factories.js';
import { mailsTo } from '../../support/mail.js';
import { freePort, mailFolder, makeLapseWorld, makeQualification, settableClock } from './lapse-factories.js';

const originalTz = process.env.TZ;
const setProcessZone = (zone: string) => {
  process.env.TZ = zone;
  expect(serverTimeZone()).toBe(zone);
};

describe('a company clock', () => {
  let api: TestApi;
  let catcher: MailCatcher;
  let dir: string;
  const clock = settableClock();
  beforeAll(async () => {
    dir = await mailFolder();
    const port = await freePort();
    catcher = await startMailCatcher({ port, dir });
    api = await startTestApi({ clock, config: { smtp: { ...testConfig().smtp, port } } });
  });
  afterEach(() => {
    if (originalTz === undefined) delete process.env.TZ;
    else process.env.TZ = originalTz;
  });
  afterAll(async () => {
    await api.close();
    await catcher.close();
    await rm(dir, { recursive: true, force: true });
  });

  it('reads dates on the wall clock of a zone (published: IANA tz database, America/Chicago CDT = UTC−5, Australia/Sydney AEST = UTC+10)', () => {
    const at = new Date('2026-06-01T23:30:00Z');
    expect(wallTimeIn('America/Chicago', at)).toEqual({ day: '2026-06-01', hhmm: '18:30' });
    expect(wallTimeIn('Australia/Sydney', at)).toEqual({ day: '2026-06-02', hhmm: '09:30' });
    expect(wallTimeIn('UTC', at)).toEqual({ day: '2026-06-01', hhmm: '23:30' });
    // Midnight is 00, not 24.
    expect(wallTimeIn('America/Chicago', new Date('2026-06-02T05:00:00Z'))).toEqual({ day: '2026-06-02', hhmm: '00:00' });
  });

  it('defect 4: in America/Chicago an evening tick runs no early run, and the 06:00 run the next morning says "1 day left", not "lapsed today"', async () => {
    setProcessZone('America/Chicago');
    const w = await makeLapseWorld(api.ds);
    await makeQualification(api.ds, w.org, w.qa, w.weldersA[0]!, { lapsesOn: '2026-06-02', lastEvidence: '2025-12-02' });
    // 2026-06-01 18:30 in Chicago is already 06-02 in UTC: the old code ran "06:00" here with tomorrow's date.
    const evening = new Date('2026-06-01T23:30:00Z');
    clock.set(evening.toISOString());
    const [first] = await runDueLapseWatch(api.deps, evening, [w.org.id]);
    expect(first).toMatchObject({ asOf: '2026-06-01', status: 'done' });
    // No second run for 06-01 later that evening, and the next one only at 06:00 Chicago on 06-02.
    expect(await runDueLapseWatch(api.deps, new Date('2026-06-02T04:59:00Z'), [w.org.id])).toEqual([]);
    expect(await runDueLapseWatch(api.deps, new Date('2026-06-02T10:59:00Z'), [w.org.id])).toEqual([]);
    clock.set('2026-06-02T11:00:00Z');
    const [next] = await runDueLapseWatch(api.deps, new Date('2026-06-02T11:00:00Z'), [w.org.id]);
    expect(next).toMatchObject({ asOf: '2026-06-02', status: 'done' });
    const mails = await mailsTo(dir, w.qa.email);
    expect(mails.map((m) => m.subject)).toEqual([
      `${w.org.name} lapse watch 2026-06-01: 1 lapsing`,
      `${w.org.name} lapse watch 2026-06-02: 1 lapsed`,
    ]);
    expect(mails[0]!.text).toContain('lapses on 2026-06-02 (1 day left)');
    expect(mails[1]!.text).toContain('lapsed on 2026-06-02 (today; last qualified day 2026-06-01)');
  });

  it('defect 4: in Australia/Sydney the 06:00 run comes at 20:00 UTC the day before and is dated the Sydney day', async () => {
    setProcessZone('Australia/Sydney');
    const w = await makeLapseWorld(api.ds);
    await makeQualification(api.ds, w.org, w.qa, w.weldersA[0]!, { lapsesOn: '2026-06-02', lastEvidence: '2025-12-02' });
    expect(await runDueLapseWatch(api.deps, new Date('2026-06-01T19:59:00Z'), [w.org.id])).toEqual([]);
    clock.set('2026-06-01T20:00:00Z');
    const [run] = await runDueLapseWatch(api.deps, new Date('2026-06-01T20:00:00Z'), [w.org.id]);
    expect(run).toMatchObject({ asOf: '2026-06-02', status: 'done' });
    const [mail] = await mailsTo(dir, w.qa.email);
    expect(mail!.subject).toBe(`${w.org.name} lapse watch 2026-06-02: 1 lapsed`);
    expect(mail!.text).toContain('lapsed on 2026-06-02 (today; last qualified day 2026-06-01)');
  });

  it('defect 4: a company in its own zone (Chicago) on a Sydney server: Settings, status and the verify page use the Chicago day', async () => {
    setProcessZone('Australia/Sydney');
    const w = await makeLapseWorld(api.ds);
    const q = await makeQualification(api.ds, w.org, w.qa, w.weldersA[0]!, { lapsesOn: '2026-06-02', lastEvidence: '2025-12-02' });
    // 2026-06-01 20:00 UTC: 06-02 06:00 in Sydney, 06-01 15:00 in Chicago.
    clock.set('2026-06-01T20:00:00Z');
    const qa = await signIn(api.app, w.qa.email, TEST_PASSWORD);
    const before = bodyOf(companySettingsSchema, await qa.get('/api/settings'));
    expect(before).toMatchObject({ timeZone: 'Australia/Sydney', timeZoneIsServerDefault: true, today: '2026-06-02' });
    const bad = await qa.patch('/api/settings').send({ timeZone: 'Mars/Olympus_Mons' });
    expect(bad.status).toBe(400);
    expect(errorOf(bad).fields).toHaveProperty('timeZone');
    const saved = bodyOf(companySettingsSchema, await qa.patch('/api/settings').send({ timeZone: 'America/Chicago' }));
    expect(saved).toMatchObject({ timeZone: 'America/Chicago', timeZoneIsServerDefault: false, serverTimeZone: 'Australia/Sydney', today: '2026-06-01' });

    // Still qualified on the company's day (it lapses on 06-02, the Sydney date).
    const qual = bodyOf(qualificationSchema, await qa.get(`/api/qualifications/${q.id}`));
    expect(qual.status.state).toBe('lapsing');
    const issued = await qa.post(`/api/welders/${w.weldersA[1]!.id}/verify-token`);
    expect(issued.status, JSON.stringify(issued.body)).toBe(201);
    const token = (issued.body as { url: string }).url.split('/verify/')[1]!;
    const view = bodyOf(verifySchema, await qa.get(`/api/verify/${token}`));
    expect(view).toMatchObject({ asOf: '2026-06-01', leftOn: null });
    // A preview defaults to the company's day.
    expect(bodyOf(lapseWatchPreviewSchema, await qa.get('/api/lapse-watch/preview')).asOf).toBe('2026-06-01');
    // The caller learns the company's zone (the web computes the current month in it), and the
    // continuity log's "today", its current month and its future-date check follow the Chicago day.
    // 2026-06-02 03:00 UTC is still 06-01 (22:00) in Chicago: the UTC date would be a day ahead.
    clock.set('2026-06-02T03:00:00Z');
    expect(bodyOf(meSchema, await qa.get('/api/me')).timeZone).toBe('America/Chicago');
    const grid = bodyOf(gridSchema, await qa.get('/api/continuity/grid').query({ shopId: w.shopA.id, month: '2026-06' }));
    expect(grid.today).toBe('2026-06-01');
    const ahead = await qa.put('/api/continuity/grid').send({
      shopId: w.shopA.id,
      month: '2026-06',
      cells: [{ welderId: w.weldersA[1]!.id, process: 'SMAW', usedOn: '2026-06-02', jobReference: 'J-1' }],
    });
    expect(ahead.status).toBe(400);
    expect(errorOf(ahead).fields).toHaveProperty(['cells.0.usedOn']);
  });

  it('defect 5: a run dated tomorrow or yesterday is refused (400 naming asOf) and writes nothing; preview looks ahead and back without using up a notice', async () => {
    const w = await makeLapseWorld(api.ds);
    await makeQualification(api.ds, w.org, w.qa, w.weldersA[0]!, { lapsesOn: '2026-06-20', lastEvidence: '2025-12-20' });
    clock.day('2026-06-01');
    const today = todayIn(serverTimeZone(), clock);
    expect(today).toBe('2026-06-01');
    const qa = await signIn(api.app, w.qa.email, TEST_PASSWORD);
    for (const asOf of ['2026-06-15', '2026-05-01']) {
      const res = await qa.post('/api/lapse-watch/runs').send({ asOf });
      expect(res.status).toBe(400);
      expect(errorOf(res).fields?.asOf).toContain('A run can only be dated today: 2026-06-01');
    }
    // Preview 06-15 (7-day and 30-day warnings) and back on 05-01 (nothing yet): nothing written.
    const ahead = bodyOf(lapseWatchPreviewSchema, await qa.get('/api/lapse-watch/preview?asOf=2026-06-15'));
    expect(ahead.notices.map((n) => [n.threshold, n.daysLeft])).toEqual([['30', 5], ['7', 5]]);
    expect(bodyOf(lapseWatchPreviewSchema, await qa.get('/api/lapse-watch/preview?asOf=2026-05-01')).notices).toEqual([]);
    const counts = async () =>
      (await api.ds.query<{ runs: number; notices: number }[]>(
        `SELECT (SELECT count(*)::int FROM lapse_watch_runs WHERE organization_id = $1) AS runs,
                (SELECT count(*)::int FROM lapse_notices WHERE organization_id = $1) AS notices`,
        [w.org.id],
      ))[0];
    expect(await counts()).toEqual({ runs: 0, notices: 0 });
    expect(await mailsTo(dir, w.qa.email)).toHaveLength(0);
    // Today's run (no date, or today's date) writes and sends the 30-day warning.
    const ran = await qa.post('/api/lapse-watch/runs').send({ asOf: '2026-06-01' });
    expect(ran.status).toBe(201);
    expect(ran.body).toMatchObject({ asOf: '2026-06-01', noticesCreated: 1, emailsSent: 3 });
    // On 06-15 the 7-day warning is still there to send: the look-ahead used nothing up.
    clock.day('2026-06-15');
    const qaLater = await signIn(api.app, w.qa.email, TEST_PASSWORD); // two weeks on: a new session
    const later = await qaLater.post('/api/lapse-watch/runs').send({});
    expect(later.body).toMatchObject({ asOf: '2026-06-15', noticesCreated: 1, emailsSent: 3 });
    expect((await mailsTo(dir, w.qa.email)).at(-1)!.text).toContain('lapses on 2026-06-20 (5 days left)');
  });
});
