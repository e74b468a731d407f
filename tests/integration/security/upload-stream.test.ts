// Finding 8 (issue 11): an upload streams to the object store as it arrives (never held whole in memory),
// with the 15 MB cap enforced while the bytes flow, and is never half-saved: a refused, oversize or
// broken-off upload leaves no row and no object.
import http from 'node:http';
import type { AddressInfo } from 'node:net';
import { deflateSync } from 'node:zlib';
import { ListObjectsV2Command, S3Client } from '@aws-sdk/client-s3';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { uploadSchema } from '@beadroll/rules';
import { binaryBody } from '../../support/api-records.js';
import { bodyOf, errorOf, signIn, startTestApi, type TestApi } from '../../support/api-app.js';
import { makeWorld, TEST_PASSWORD } from '../../support/factories.js';
import { watchStreamedUploads, type Taken } from '../../support/storage-watch.js';

const MB = 1024 * 1024;
const latin1 = (s: string) => Buffer.from(s, 'latin1');
/** A plain PDF of about `size` bytes: one uncompressed stream of text that names nothing active. */
const bigPdf = (size: number, extra: Buffer = Buffer.alloc(0)) => {
  const filler = Buffer.alloc(size, '0123456789abcdef\n');
  return Buffer.concat([
    latin1(`%PDF-1.4\n1 0 obj\n<< /Type /Catalog >>\nendobj\n2 0 obj\n<< /Length ${size} >>\nstream\n`),
    filler,
    latin1('\nendstream\nendobj\n'),
    extra,
    latin1('trailer\n<< /Root 1 0 R >>\n%%EOF\n'),
  ]);
};

describe('uploads stream to the object store', () => {
  let api: TestApi;
  let s3: S3Client;
  /** Bytes the object store has taken from each streamed upload so far, by key; and whether it ended. */
  let taken: Map<string, Taken>;
  beforeAll(async () => {
    api = await startTestApi();
    const c = api.config.s3;
    s3 = new S3Client({
      endpoint: c.endpoint,
      region: c.region,
      forcePathStyle: c.forcePathStyle,
      credentials: { accessKeyId: c.accessKeyId, secretAccessKey: c.secretAccessKey },
    });
    taken = watchStreamedUploads(api.deps.storage);
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

  it('stores a 12 MB PDF in parts and gives it back byte for byte', { timeout: 60_000 }, async () => {
    const world = await makeWorld(api.ds);
    const qa = await signIn(api.app, world.qa.email, TEST_PASSWORD);
    const file = bigPdf(12 * MB);
    const res = await qa.post('/api/uploads').field('kind', 'other').attach('file', file, 'big-report.pdf');
    expect(res.status).toBe(201);
    const upload = bodyOf(uploadSchema, res);
    expect(upload.size).toBe(file.length);
    const back = await qa.get(`/api/uploads/${upload.id}/content`).buffer(true).parse(binaryBody).expect(200);
    expect((back.body as Buffer).equals(file)).toBe(true);
  });

  it(
    'refuses a 12 MB PDF whose JavaScript comes after the first parts were stored, and keeps nothing',
    { timeout: 60_000 },
    async () => {
      const world = await makeWorld(api.ds);
      const qa = await signIn(api.app, world.qa.email, TEST_PASSWORD);
      const script = Buffer.concat([
        latin1('3 0 obj\n<< /Filter /FlateDecode /Length 40 >>\nstream\n'),
        deflateSync(latin1('<< /S /JavaScript /JS (app.alert(1)) >>')),
        latin1('\nendstream\nendobj\n'),
      ]);
      const res = await qa
        .post('/api/uploads')
        .field('kind', 'other')
        .attach('file', bigPdf(12 * MB, script), 'late.pdf');
      expect(res.status).toBe(400);
      expect(errorOf(res).fields?.file).toMatch(/acts when opened \(JavaScript\)/);
      expect(await rowsOf(world.org.id)).toBe(0);
      expect(await objectsOf(world.org.id)).toEqual([]);
    },
  );

  it(
    'passes the file to the store while it is still arriving; an upload broken off halfway leaves no row and no object',
    { timeout: 60_000 },
    async () => {
      const world = await makeWorld(api.ds);
      const login = await (
        await signIn(api.app, world.qa.email, TEST_PASSWORD)
      )
        .post('/api/auth/login')
        .send({ email: world.qa.email, password: TEST_PASSWORD });
      const cookie = (login.headers['set-cookie'] as unknown as string[])
        .map((c) => c.split(';')[0])
        .join('; ');
      const server = api.app.listen(0, '127.0.0.1');
      await new Promise((r) => server.once('listening', r));
      try {
        const boundary = 'beadroll-stream-test';
        const req = http.request({
          host: '127.0.0.1',
          port: (server.address() as AddressInfo).port,
          method: 'POST',
          path: '/api/uploads',
          headers: {
            cookie,
            'content-type': `multipart/form-data; boundary=${boundary}`,
            'content-length': String(14 * MB),
          },
        });
        req.on('error', () => undefined);
        req.write(`--${boundary}\r\ncontent-disposition: form-data; name="kind"\r\n\r\nother\r\n`);
        req.write(
          `--${boundary}\r\ncontent-disposition: form-data; name="file"; filename="cut-off.pdf"\r\ncontent-type: application/pdf\r\n\r\n`,
        );
        const before = new Set(taken.keys());
        const body = bigPdf(12 * MB);
        // Send 7 MB of the 12 and wait until the store has taken more than one 5 MB part of it.
        for (let at = 0; at < 7 * MB; at += 256 * 1024) {
          if (!req.write(body.subarray(at, at + 256 * 1024))) await new Promise((r) => req.once('drain', r));
        }
        const deadline = Date.now() + 30_000;
        let key: string | undefined;
        while (Date.now() < deadline) {
          key = [...taken.keys()].find((k) => !before.has(k) && k.startsWith(`uploads/${world.org.id}/`));
          if (key && taken.get(key)!.bytes > 5 * MB) break;
          await new Promise((r) => setTimeout(r, 50));
        }
        expect(key).toBeDefined();
        expect(taken.get(key!)!.bytes).toBeGreaterThan(5 * MB);
        expect(taken.get(key!)!.settled).toBe(false);
        // The client goes away with the file half sent.
        req.destroy();
        while (!taken.get(key!)!.settled && Date.now() < deadline)
          await new Promise((r) => setTimeout(r, 50));
        expect(taken.get(key!)!.settled).toBe(true);
        await new Promise((r) => setTimeout(r, 300));
        expect(await rowsOf(world.org.id)).toBe(0);
        expect(await objectsOf(world.org.id)).toEqual([]);
      } finally {
        server.closeAllConnections();
        await new Promise((r) => server.close(r));
      }
    },
  );
});
