import { randomUUID } from 'node:crypto';
import { ListObjectsV2Command, S3Client } from '@aws-sdk/client-s3';
import { uploadBuffer } from '../../../apps/api/src/uploads/uploads.service.js';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { couponRecordSchema, procedureSchema, uploadSchema } from '@beadroll/rules';
import { bodyOf, errorOf, signIn, startTestApi, type TestApi } from '../../support/api-app.js';
import { auditRows, makeOtherCompany, makeWorld, TEST_PASSWORD } from '../../support/factories.js';
import { binaryBody, couponBody, makeProcedure, samplePdf, samplePng } from '../../support/api-records.js';

const binary = (res: { body: unknown }) => res.body as Buffer;

describe('uploads', () => {
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

  const objectsOf = async (orgId: string) =>
    (
      await s3.send(new ListObjectsV2Command({ Bucket: api.config.s3.bucket, Prefix: `uploads/${orgId}/` }))
    ).Contents?.map((o) => o.Key) ?? [];
  const rowsOf = async (orgId: string) =>
    (
      await api.ds.query<{ n: number }[]>(
        `SELECT count(*)::int AS n FROM uploads WHERE organization_id = $1`,
        [orgId],
      )
    )[0]!.n;

  it('accepts a real PNG and a real PDF and gives them back byte for byte with the original name', async () => {
    const world = await makeWorld(api.ds);
    const qa = await signIn(api.app, world.qa.email, TEST_PASSWORD);
    const png = samplePng();
    const pdf = await samplePdf();
    const up1 = bodyOf(
      uploadSchema,
      await qa
        .post('/api/uploads')
        .field('kind', 'specimen-photo')
        .attach('file', png, 'Root bend R1 — Größe.png')
        .expect(201),
    );
    expect(up1).toMatchObject({
      fileName: 'Root bend R1 — Größe.png',
      contentType: 'image/png',
      size: png.length,
      kind: 'specimen-photo',
    });
    const up2 = bodyOf(
      uploadSchema,
      await qa
        .post('/api/uploads')
        .field('kind', 'examination-report')
        .attach('file', pdf, 'lab-report.pdf')
        .expect(201),
    );
    expect(up2.contentType).toBe('application/pdf');

    const back = await qa.get(`/api/uploads/${up1.id}/content`).buffer(true).parse(binaryBody).expect(200);
    expect(back.headers['content-type']).toBe('image/png');
    expect(back.headers['content-disposition']).toBe(
      `attachment; filename*=UTF-8''${encodeURIComponent('Root bend R1 — Größe.png')}`,
    );
    expect(binary(back).equals(png)).toBe(true);
    const inline = await qa
      .get(`/api/uploads/${up2.id}/content?inline=1`)
      .buffer(true)
      .parse(binaryBody)
      .expect(200);
    expect(inline.headers['content-disposition']).toMatch(/^inline; /);
    expect(binary(inline).equals(pdf)).toBe(true);
    await qa.get(`/api/uploads/${up2.id}`).expect(200);

    const [row] = await api.ds.query<{ sha256: string; storageKey: string }[]>(
      `SELECT sha256, storage_key AS "storageKey" FROM uploads WHERE id = $1`,
      [up1.id],
    );
    expect(row!.storageKey).toMatch(new RegExp(`^uploads/${world.org.id}/[0-9a-f-]{36}$`));
    expect(await objectsOf(world.org.id)).toHaveLength(2);
    expect((await auditRows(api.ds, up1.id)).map((a) => a.action)).toEqual(['upload.created']);
  });

  it('refuses a text file renamed .png with 400 on fields.file and leaves no row and no object', async () => {
    const world = await makeWorld(api.ds);
    const qa = await signIn(api.app, world.qa.email, TEST_PASSWORD);
    const res = await qa
      .post('/api/uploads')
      .field('kind', 'specimen-photo')
      .attach('file', Buffer.from('just some notes\n'), 'photo.png');
    expect(res.status).toBe(400);
    expect(errorOf(res).fields?.file).toBe(
      'Only JPEG, PNG, WebP, HEIC images and PDF files can be attached; this file is not recognised',
    );
    // A real file of another type is named by what it is.
    const zip = Buffer.from('504b0304140000000800', 'hex');
    const res2 = await qa
      .post('/api/uploads')
      .attach('file', Buffer.concat([zip, Buffer.alloc(200)]), 'x.pdf');
    expect(res2.status).toBe(400);
    expect(await rowsOf(world.org.id)).toBe(0);
    expect(await objectsOf(world.org.id)).toEqual([]);
  });

  it('refuses a file over 15 MB with 413 and leaves nothing behind', async () => {
    const world = await makeWorld(api.ds);
    const qa = await signIn(api.app, world.qa.email, TEST_PASSWORD);
    const big = Buffer.concat([samplePng(), Buffer.alloc(15 * 1024 * 1024 + 10)]);
    const res = await qa.post('/api/uploads').attach('file', big, 'big.png');
    expect(res.status).toBe(413);
    expect(errorOf(res).code).toBe('payload_too_large');
    expect(await rowsOf(world.org.id)).toBe(0);
    expect(await objectsOf(world.org.id)).toEqual([]);
  });

  it('deletes the stored object when the row cannot be written (a database error after the upload)', async () => {
    const world = await makeWorld(api.ds);
    // An actor whose user row does not exist: the uploaded_by foreign key fails after the object is stored.
    const ghost = {
      id: randomUUID(),
      organizationId: world.org.id,
      role: 'qa_manager' as const,
      welderId: null,
      shopIds: [],
    };
    await expect(
      uploadBuffer(api.deps, ghost, { buffer: samplePng(), originalname: 'ghost.png' }, 'other'),
    ).rejects.toThrow();
    expect(await rowsOf(world.org.id)).toBe(0);
    expect(await objectsOf(world.org.id)).toEqual([]);
  });

  it('asks for a file and a known kind', async () => {
    const world = await makeWorld(api.ds);
    const qa = await signIn(api.app, world.qa.email, TEST_PASSWORD);
    expect(errorOf(await qa.post('/api/uploads').field('kind', 'other').expect(400)).fields).toHaveProperty(
      'file',
    );
    const res = await qa.post('/api/uploads').field('kind', 'selfie').attach('file', samplePng(), 'a.png');
    expect(errorOf(res).fields).toHaveProperty('kind');
    expect(await objectsOf(world.org.id)).toEqual([]);
  });

  it("answers 404 for another company's upload id, and 400 when it is attached", async () => {
    const world = await makeWorld(api.ds);
    const other = await makeOtherCompany(api.ds);
    const otherQa = await signIn(api.app, other.qa.email, TEST_PASSWORD);
    const foreign = bodyOf(
      uploadSchema,
      await otherQa.post('/api/uploads').attach('file', samplePng(), 'z.png').expect(201),
    );
    const qa = await signIn(api.app, world.qa.email, TEST_PASSWORD);
    expect((await qa.get(`/api/uploads/${foreign.id}`)).status).toBe(404);
    expect((await qa.get(`/api/uploads/${foreign.id}/content`)).status).toBe(404);
    const wps = await makeProcedure(api.ds, world.org, { number: 'U-1' });
    const ids = { welderId: world.weldersA[0]!.id, shopId: world.shopA.id, procedureId: wps.id };
    const body = couponBody(ids, {
      examination: {
        method: 'bend',
        criteria: 'asme-ix',
        specimens: [
          { kind: 'face', discontinuities: [], photoUploadId: foreign.id },
          { kind: 'face', discontinuities: [] },
          { kind: 'root', discontinuities: [] },
          { kind: 'root', discontinuities: [] },
        ],
      },
    });
    const res = await qa.post('/api/coupons').send(body);
    expect(errorOf(res).fields).toEqual({
      'examination.bend.specimens.0.photoUploadId': 'No such upload in your company',
    });
    const res2 = await qa.post('/api/procedures').send({
      number: 'U-2',
      revision: 'A',
      code: 'asme-ix',
      processes: ['SMAW'],
      documentUploadId: foreign.id,
    });
    expect(errorOf(res2).fields).toHaveProperty('documentUploadId');
  });

  it('serves a coupon photo to the foreman of the shop and to the welder, not to others; only the QA manager uploads', async () => {
    const world = await makeWorld(api.ds);
    const qa = await signIn(api.app, world.qa.email, TEST_PASSWORD);
    const photo = bodyOf(
      uploadSchema,
      await qa
        .post('/api/uploads')
        .field('kind', 'specimen-photo')
        .attach('file', samplePng(), 'r1.png')
        .expect(201),
    );
    const loose = bodyOf(
      uploadSchema,
      await qa.post('/api/uploads').attach('file', samplePng(), 'loose.png').expect(201),
    );
    const wps = await makeProcedure(api.ds, world.org, { number: 'U-3' });
    const ids = { welderId: world.weldersA[0]!.id, shopId: world.shopA.id, procedureId: wps.id };
    const coupon = bodyOf(
      couponRecordSchema,
      await qa
        .post('/api/coupons')
        .send(
          couponBody(ids, {
            examination: {
              method: 'bend',
              criteria: 'asme-ix',
              specimens: [
                { kind: 'root', discontinuities: [], photoUploadId: photo.id },
                { kind: 'root', discontinuities: [] },
                { kind: 'face', discontinuities: [] },
                { kind: 'face', discontinuities: [] },
              ],
            },
          }),
        )
        .expect(201),
    );
    expect(coupon.examination.bend?.specimens[0]?.photo?.fileName).toBe('r1.png');

    const foreman = await signIn(api.app, world.foreman.email, TEST_PASSWORD);
    await foreman.get(`/api/uploads/${photo.id}/content`).expect(200);
    expect((await foreman.get(`/api/uploads/${loose.id}`)).status).toBe(404);
    expect((await foreman.post('/api/uploads').attach('file', samplePng(), 'f.png')).status).toBe(403);
    const welder = await signIn(api.app, world.welder.email, TEST_PASSWORD);
    await welder.get(`/api/uploads/${photo.id}`).expect(200);
    expect((await welder.get(`/api/uploads/${loose.id}`)).status).toBe(404);

    // A WPS document is shown with the procedure.
    const wpsDoc = bodyOf(
      uploadSchema,
      await qa
        .post('/api/uploads')
        .field('kind', 'wps-document')
        .attach('file', await samplePdf('WPS U-4'), 'U-4.pdf')
        .expect(201),
    );
    const p = bodyOf(
      procedureSchema,
      await qa
        .post('/api/procedures')
        .send({
          number: 'U-4',
          revision: 'A',
          code: 'asme-ix',
          processes: ['SMAW'],
          documentUploadId: wpsDoc.id,
        })
        .expect(201),
    );
    expect(p.document).toMatchObject({ id: wpsDoc.id, fileName: 'U-4.pdf', contentType: 'application/pdf' });
  });
});
