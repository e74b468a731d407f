// Finding 8: active PDFs are refused; images keep only their picture (a PNG+HTML polyglot loses its
// HTML); direction overrides leave file names (see input.test.ts).
import { deflateSync } from 'node:zlib';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { binaryBody } from '../../support/api-records.js';
import { errorOf, signIn, startTestApi, type TestApi } from '../../support/api-app.js';
import { makeWorld, TEST_PASSWORD } from '../../support/factories.js';

const PNG = Buffer.from(
  'iVBORw0KGgoAAAANSUhEUgAAAAEAAAABCAYAAAAfFcSJAAAADUlEQVR42mP8z8BQDwAEhQGAhKmMIQAAAABJRU5ErkJggg==',
  'base64',
);
const pdf = (body: string) =>
  Buffer.from(`%PDF-1.4\n1 0 obj\n<< /Type /Catalog ${body} >>\nendobj\ntrailer\n<< /Root 1 0 R >>\n%%EOF\n`, 'latin1');

describe('what an upload may carry', () => {
  let api: TestApi;
  let qa: Awaited<ReturnType<typeof signIn>>;
  beforeAll(async () => {
    api = await startTestApi();
    const world = await makeWorld(api.ds);
    qa = await signIn(api.app, world.qa.email, TEST_PASSWORD);
  });
  afterAll(() => api.close());

  it('refuses a PDF that runs JavaScript, opens an action or launches, however it spells or packs it', async () => {
    const compressed = deflateSync(Buffer.from('<< /S /JavaScript /JS (app.alert(1)) >>'));
    const packed = Buffer.concat([
      Buffer.from('%PDF-1.5\n2 0 obj\n<< /Type /ObjStm /Filter /FlateDecode /Length 99 >>\nstream\n', 'latin1'),
      compressed,
      Buffer.from('\nendstream\nendobj\n%%EOF\n', 'latin1'),
    ]);
    for (const [name, file] of [
      ['open action', pdf('/OpenAction << /S /JavaScript /JS (app.alert(1)) >>')],
      ['escaped name', pdf('/Names << /J#61vaScript 3 0 R >>')],
      ['launch', pdf('/AA << /O << /S /Launch /F (cmd.exe) >> >>')],
      ['object stream', packed],
    ] as const) {
      const res = await qa.post('/api/uploads').field('kind', 'other').attach('file', file, 'report.pdf');
      expect(res.status, name).toBe(400);
      expect(errorOf(res).fields?.file).toMatch(/acts when opened/);
    }
    const plain = await qa.post('/api/uploads').field('kind', 'other').attach('file', pdf('/Pages 2 0 R'), 'plain.pdf');
    expect(plain.status).toBe(201);
  });

  it('cuts what follows the picture out of a PNG and a JPEG, and keeps a plain image byte for byte', async () => {
    const html = Buffer.from('<html><script>alert(document.cookie)</script></html>');
    const poly = await qa.post('/api/uploads').field('kind', 'other').attach('file', Buffer.concat([PNG, html]), 'poly.png');
    expect(poly.status).toBe(201);
    const { id, size } = poly.body as { id: string; size: number };
    expect(size).toBe(PNG.length);
    const back = await qa.get(`/api/uploads/${id}/content`).buffer(true).parse(binaryBody).expect(200);
    expect((back.body as Buffer).equals(PNG)).toBe(true);

    const jpeg = Buffer.from([
      0xff, 0xd8, 0xff, 0xe0, 0x00, 0x10, 0x4a, 0x46, 0x49, 0x46, 0x00, 0x01, 0x01, 0x00, 0x00, 0x01, 0x00, 0x01, 0x00, 0x00,
      0xff, 0xda, 0x00, 0x08, 0x01, 0x01, 0x00, 0x00, 0x3f, 0x00, 0x12, 0xff, 0x00, 0x34, 0xff, 0xd0, 0x56, 0xff, 0xd9,
    ]);
    const tail = await qa.post('/api/uploads').field('kind', 'other').attach('file', Buffer.concat([jpeg, html]), 'photo.jpg');
    expect(tail.status).toBe(201);
    expect((tail.body as { size: number }).size).toBe(jpeg.length);

    const clean = await qa.post('/api/uploads').field('kind', 'other').attach('file', PNG, 'clean.png');
    expect((clean.body as { size: number }).size).toBe(PNG.length);
  });
});
