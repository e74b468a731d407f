// Photos uploaded from the coupon form before the coupon is saved are pending; saving the coupon attaches
// them; a form abandoned leaves pending files that the sweep removes after a day, row and object, with the
// reason in the audit trail. A save that names a swept file is refused on its field, never half-saved.
import { HeadObjectCommand, S3Client } from '@aws-sdk/client-s3';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { couponRecordSchema, uploadSchema } from '@beadroll/rules';
import { sweepPendingUploads } from '../../../apps/api/src/uploads/uploads.service.js';
import { bodyOf, errorOf, signIn, startTestApi, type TestApi } from '../../support/api-app.js';
import { makeWorld, TEST_PASSWORD } from '../../support/factories.js';
import { couponBody, makeProcedure, samplePng } from '../../support/api-records.js';

describe('uploads pending until a record names them', () => {
  let api: TestApi;
  let s3: S3Client;
  beforeAll(async () => {
    api = await startTestApi();
    const c = api.config.s3;
    s3 = new S3Client({
      endpoint: c.endpoint,
      region: c.region,
      forcePathStyle: c.forcePathStyle,
      credentials: { accessKeyId: c.accessKeyId, secretAccessKey: c.secretAccessKey },
    });
  });
  afterAll(async () => {
    s3.destroy();
    await api.close();
  });

  const stored = async (id: string) => {
    const [row] = await api.ds.query<{ key: string; attached: boolean }[]>(
      `SELECT storage_key AS key, attached_at IS NOT NULL AS attached FROM uploads WHERE id = $1`,
      [id],
    );
    if (!row) return { row: false, object: false, attached: false };
    const object = await s3
      .send(new HeadObjectCommand({ Bucket: api.config.s3.bucket, Key: row.key }))
      .then(() => true, () => false);
    return { row: true, object, attached: row.attached };
  };
  /** As if uploaded a day and an hour ago: only this test's rows, so other files' fresh uploads are left alone. */
  const age = (ids: string[]) =>
    api.ds.query(`UPDATE uploads SET created_at = created_at - interval '25 hours' WHERE id = ANY($1::uuid[])`, [ids]);

  it('attaches the photos of a saved coupon and sweeps those of an abandoned form after a day', async () => {
    const world = await makeWorld(api.ds);
    const qa = await signIn(api.app, world.qa.email, TEST_PASSWORD);
    const upload = async (name: string) =>
      bodyOf(
        uploadSchema,
        await qa.post('/api/uploads').field('kind', 'specimen-photo').attach('file', samplePng(), name).expect(201),
      ).id;
    const kept = await upload('R1 saved.png');
    const abandoned = await upload('R1 abandoned.png');
    const fresh = await upload('R1 just now.png');
    expect(await stored(abandoned)).toEqual({ row: true, object: true, attached: false });

    const wps = await makeProcedure(api.ds, world.org, { number: 'PEND-1' });
    const ids = { welderId: world.weldersA[0]!.id, shopId: world.shopA.id, procedureId: wps.id };
    const withPhoto = (photo: string) =>
      couponBody(ids, {
        examination: {
          method: 'bend',
          criteria: 'asme-ix',
          specimens: [
            { kind: 'face', discontinuities: [], photoUploadId: photo },
            { kind: 'face', discontinuities: [] },
            { kind: 'root', discontinuities: [] },
            { kind: 'root', discontinuities: [] },
          ],
        },
      });
    bodyOf(couponRecordSchema, await qa.post('/api/coupons').send(withPhoto(kept)).expect(201));
    expect((await stored(kept)).attached).toBe(true);

    await age([kept, abandoned]);
    expect(await sweepPendingUploads(api.deps)).toBeGreaterThanOrEqual(1);
    expect(await stored(kept)).toEqual({ row: true, object: true, attached: true });
    expect(await stored(abandoned)).toEqual({ row: false, object: false, attached: false });
    expect(await stored(fresh)).toEqual({ row: true, object: true, attached: false });
    const audit = await api.ds.query<{ action: string; actor: string | null; before: { fileName: string } }[]>(
      `SELECT action, actor_id AS actor, before FROM audit_events WHERE entity_id = $1 ORDER BY at`,
      [abandoned],
    );
    expect(audit.map((a) => a.action)).toEqual(['upload.created', 'upload.discarded']);
    expect(audit[1]).toMatchObject({ actor: null, before: { fileName: 'R1 abandoned.png' } });

    // A form reopened after the sweep cannot save the swept photo: refused on its field, nothing saved.
    const before = await api.ds.query<{ n: number }[]>(`SELECT count(*)::int AS n FROM coupons WHERE welder_id = $1`, [ids.welderId]);
    const late = await qa.post('/api/coupons').send(withPhoto(abandoned));
    expect(late.status).toBe(400);
    expect(errorOf(late).fields).toEqual({ 'examination.bend.specimens.0.photoUploadId': 'No such upload in your company' });
    const after = await api.ds.query<{ n: number }[]>(`SELECT count(*)::int AS n FROM coupons WHERE welder_id = $1`, [ids.welderId]);
    expect(after).toEqual(before);
  });
});
