// The smaller defects of issue 8 in lapse watch's part (defect 10): deadlocks and serialization failures
// retried inside the transaction helper and answered 409 "try again" when they persist (never 500);
// skipped runs stored with their company and shown to no other; settings changes serialized (lock before
// read); a welder who left is "no longer with the company" on the verify page, their link revoked.
import request from 'supertest';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { companySettingsSchema, lapseWatchRunListSchema, verifySchema } from '@beadroll/rules';
import { runLapseWatch } from '../../../apps/api/src/jobs/lapse-watch.job.js';
import { AppError, toAppError } from '../../../apps/api/src/lib/errors.js';
import { bodyOf, errorOf, signIn, startTestApi, type TestApi } from '../../support/api-app.js';
import { makeOtherCompany, TEST_PASSWORD } from '../../support/factories.js';
import { makeLapseWorld } from './lapse-factories.js';

describe('lapse watch boundaries (defect 10)', () => {
  let api: TestApi;
  beforeAll(async () => {
    api = await startTestApi();
  });
  afterAll(() => api.close());

  it('retries a real deadlock inside the transaction helper: both transactions commit', async () => {
    const w = await makeLapseWorld(api.ds);
    const [a, b] = [w.weldersA[0]!.id, w.weldersA[1]!.id];
    let tries = 0;
    let release!: () => void;
    const bothHoldOne = new Promise<void>((r) => (release = r));
    let holding = 0;
    const lockInOrder = (first: string, second: string, name: string) =>
      api.ds.transaction(async (db) => {
        tries++;
        await db.query(`UPDATE welders SET name = name WHERE id = $1`, [first]);
        if (++holding === 2) release();
        await bothHoldOne;
        await db.query(`UPDATE welders SET name = name || '' WHERE id = $1 AND $2::text IS NOT NULL`, [second, name]);
      });
    await Promise.all([lockInOrder(a, b, 'east'), lockInOrder(b, a, 'west')]);
    // PostgreSQL ended one of them with 40P01; the helper ran it again and it went through.
    expect(tries).toBe(3);
  });

  it('answers 409 "try again", never 500, when a conflict persists through every retry', async () => {
    let tries = 0;
    const err = await api.ds
      .transaction(async (db) => {
        tries++;
        await db.query(`DO $$ BEGIN RAISE EXCEPTION 'could not serialize access' USING ERRCODE = '40001'; END $$`);
      })
      .catch((e: unknown) => e);
    expect(tries).toBe(4);
    expect(err).toBeInstanceOf(AppError);
    expect((err as AppError).status).toBe(409);
    expect((err as AppError).message).toMatch(/Try again/);
    // A deadlock error that reaches the error handler some other way is a 409 too.
    const raw = Object.assign(new Error('deadlock detected'), { code: '40P01' });
    expect(toAppError(raw)?.status).toBe(409);
  });

  it('stores a skipped run with its company and shows it to no other company', async () => {
    const w = await makeLapseWorld(api.ds);
    const other = await makeOtherCompany(api.ds);
    const holder = api.ds.createQueryRunner();
    await holder.connect();
    try {
      await holder.query(`SELECT pg_advisory_lock(hashtext('beadroll.lapse-watch'))`);
      const [skipped] = await runLapseWatch(api.deps, { trigger: 'manual', organizationIds: [w.org.id] });
      expect(skipped).toMatchObject({ organizationId: w.org.id, status: 'skipped' });
      expect(skipped).not.toHaveProperty('instance');
    } finally {
      await holder.query(`SELECT pg_advisory_unlock(hashtext('beadroll.lapse-watch'))`);
      await holder.release();
    }
    const qa = await signIn(api.app, w.qa.email, TEST_PASSWORD);
    const mine = bodyOf(lapseWatchRunListSchema, await qa.get('/api/lapse-watch/runs'));
    expect(mine.items.map((r) => r.status)).toEqual(['skipped']);
    expect(JSON.stringify(mine)).not.toMatch(/:\d+"/); // no host:pid
    const otherQa = await signIn(api.app, other.qa.email, TEST_PASSWORD);
    expect(bodyOf(lapseWatchRunListSchema, await otherQa.get('/api/lapse-watch/runs')).items).toEqual([]);
  });

  it('serializes settings changes: two saves at once both land, each audited against what the other saved', async () => {
    const w = await makeLapseWorld(api.ds);
    const qa = await signIn(api.app, w.qa.email, TEST_PASSWORD);
    const qa2 = await signIn(api.app, w.qa2.email, TEST_PASSWORD);
    const results = await Promise.all([
      qa.patch('/api/settings').send({ warnDays: [45, 7] }),
      qa2.patch('/api/settings').send({ lapseWatchTime: '05:15' }),
      qa.patch('/api/settings').send({ closedMonthAfter: 3 }),
    ]);
    expect(results.map((r) => r.status)).toEqual([200, 200, 200]);
    expect(bodyOf(companySettingsSchema, await qa.get('/api/settings'))).toMatchObject({
      warnDays: [45, 7],
      lapseWatchTime: '05:15',
      closedMonthAfter: 3,
    });
    const audit = await api.ds.query<{ before: Record<string, unknown>; after: Record<string, unknown> }[]>(
      `SELECT before, after FROM audit_events WHERE organization_id = $1 AND entity_type = 'company-settings'`,
      [w.org.id],
    );
    // Each change names only its own field: none was computed from a copy read before another's commit.
    expect(audit.map((a) => Object.keys(a.after).sort()).sort()).toEqual([['closedMonthAfter'], ['lapseWatchTime'], ['warnDays']]);
  });

  it('says "no longer with the company" on the verify page of a welder who left; leaving revokes the link, and no new card is issued', async () => {
    const w = await makeLapseWorld(api.ds);
    const qa = await signIn(api.app, w.qa.email, TEST_PASSWORD);
    const welder = w.weldersA[1]!;
    const issued = await qa.post(`/api/welders/${welder.id}/verify-token`).expect(201);
    const token = (issued.body as { url: string }).url.split('/verify/')[1]!;
    expect(bodyOf(verifySchema, await request(api.app).get(`/api/verify/${token}`)).leftOn).toBeNull();

    await qa.patch(`/api/welders/${welder.id}`).send({ active: false, version: 1 }).expect(200);
    const view = bodyOf(verifySchema, await request(api.app).get(`/api/verify/${token}`).expect(200));
    expect(view.leftOn).toMatch(/^\d{4}-\d{2}-\d{2}$/);
    expect(view.qualifications).toEqual([]);
    expect(view.notice).toContain(`no longer with ${w.org.name}`);
    const status = await qa.get(`/api/welders/${welder.id}/verify-token`).expect(200);
    expect(status.body).toMatchObject({ active: false });
    // No new link, and no wallet card, for someone who has left.
    const again = await qa.post(`/api/welders/${welder.id}/verify-token`);
    expect(again.status).toBe(409);
    expect(errorOf(again).message).toContain('no longer with the company');
    const card = await qa.get(`/api/welders/${welder.id}/card.pdf`);
    expect(card.status).toBe(409);
    expect(errorOf(card).message).toContain('no longer with the company');
    // A link revoked by hand for a welder still employed is "no longer valid" (410 Gone, issue 10 item 9),
    // saying nothing more about the welder.
    const stays = w.weldersA[0]!;
    const t2 = ((await qa.post(`/api/welders/${stays.id}/verify-token`).expect(201)).body as { url: string }).url.split('/verify/')[1]!;
    await qa.delete(`/api/welders/${stays.id}/verify-token`).expect(204);
    const gone = await request(api.app).get(`/api/verify/${t2}`);
    expect(gone.status).toBe(410);
    expect(errorOf(gone).message).toBe('This card is no longer valid');
  });
});
