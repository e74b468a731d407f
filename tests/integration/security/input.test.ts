// Hostile text, bad encodings and absurd numbers: every one is a 400 naming its field, never a 500, and
// nothing is written.
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { errorOf, signIn, startTestApi, type TestApi } from '../../support/api-app.js';
import { makeWorld, TEST_PASSWORD } from '../../support/factories.js';
import { toAppError } from '../../../apps/api/src/lib/errors.js';

const NUL = '\u0000';
const LONE = '\uD83D';

describe('hostile input', () => {
  let api: TestApi;
  let world: Awaited<ReturnType<typeof makeWorld>>;
  let qa: Awaited<ReturnType<typeof signIn>>;
  beforeAll(async () => {
    api = await startTestApi();
    world = await makeWorld(api.ds);
    qa = await signIn(api.app, world.qa.email, TEST_PASSWORD);
  });
  afterAll(() => api.close());

  const count = async (sql: string, params: unknown[]) =>
    Number((await api.ds.query<{ n: string }[]>(sql, params))[0]!.n);

  it('refuses NUL and a lone surrogate in shop, welder and person text with the field named', async () => {
    const before = await count(`SELECT count(*) AS n FROM shops WHERE organization_id = $1`, [world.org.id]);
    for (const bad of [NUL, LONE, '\u001b[31m']) {
      const shop = await qa.post('/api/shops').send({ name: `Bay${bad}`, code: 'NX' });
      expect(shop.status, JSON.stringify(bad)).toBe(400);
      expect(Object.keys(errorOf(shop).fields ?? {})).toContain('name');
      const loc = await qa.post('/api/shops').send({ name: 'Bay', code: 'NY', location: `x${bad}` });
      expect(loc.status).toBe(400);
      expect(errorOf(loc).fields).toHaveProperty('location');
      const welder = await qa
        .post('/api/welders')
        .send({ stamp: 'N-01', name: `Ned${bad}`, homeShopId: world.shopA.id });
      expect(welder.status).toBe(400);
      expect(errorOf(welder).fields).toHaveProperty('name');
      const person = await qa
        .post('/api/people')
        .send({ email: 'nul@factory.example', name: `N${bad}`, role: 'qa_manager' });
      expect(person.status).toBe(400);
      expect(errorOf(person).fields).toHaveProperty('name');
    }
    expect(await count(`SELECT count(*) AS n FROM shops WHERE organization_id = $1`, [world.org.id])).toBe(before);
  });

  it('refuses a NUL or lone surrogate in every ?q= and in a field no schema names', async () => {
    for (const path of ['/api/welders', '/api/procedures', '/api/coupons', '/api/qualifications']) {
      for (const q of ['%00', '%1B', 'a%00b']) {
        const res = await qa.get(`${path}?q=${q}`);
        expect(res.status, `${path}?q=${q}`).toBe(400);
        expect(errorOf(res).fields).toHaveProperty('q');
      }
    }
    const stray = await qa.post('/api/shops').send({ name: 'Bay', code: 'NZ', extra: { deep: [`x${NUL}`] } });
    expect(stray.status).toBe(400);
    expect(errorOf(stray).fields).toHaveProperty(['extra.deep.0']);
  });

  it('answers bad percent-encoding in a path with 400, on public and signed-in routes', async () => {
    for (const path of ['/api/welders/%E0%A4%A', '/api/verify/%E0%A4%A', '/api/auth/tokens/%E0%A4%A', '/api/uploads/%FF']) {
      const res = await qa.get(path);
      expect(res.status, path).toBe(400);
      expect(errorOf(res).code).toBe('validation');
    }
  });

  it('answers a malformed multipart body with 400', async () => {
    const res = await qa
      .post('/api/uploads')
      .set('Content-Type', 'multipart/form-data; boundary=XYZ')
      .send('--XYZ\r\nContent-Disposition: form-data; name="file"; filename="a.pdf"\r\n\r\n%PDF-1.4 trunc');
    expect(res.status).toBe(400);
    const noBoundary = await qa.post('/api/uploads').set('Content-Type', 'multipart/form-data').send('x');
    expect(noBoundary.status).toBe(400);
  });

  it('maps every database data error to 400, naming the column when PostgreSQL knows it', async () => {
    const failure = async (sql: string, params: unknown[]) => {
      try {
        await api.ds.query(sql, params);
      } catch (err) {
        return toAppError(err);
      }
      throw new Error(`expected ${sql} to fail`);
    };
    const cases: [string, unknown[], string][] = [
      [`SELECT $1::text`, [`a${NUL}b`], '_body'], // 22021
      [`SELECT $1::int`, ['99999999999'], '_body'], // 22003
      [`SELECT $1::uuid`, ['not-a-uuid'], '_body'], // 22P02
      [`SELECT 1 / 0`, [], '_body'], // 22012
      [`INSERT INTO shops (organization_id, code, name, location) VALUES ($1, 'LL', $2, '')`, [world.org.id, 'n'.repeat(500)], 'name'], // 23514
    ];
    for (const [sql, params, field] of cases) {
      const err = await failure(sql, params);
      expect(err?.status, sql).toBe(400);
      expect(Object.keys(err?.fields ?? {}), sql).toEqual([field]);
    }
  });

  it('refuses a 1e308 mm coupon thickness with the field named', async () => {
    const res = await qa.post('/api/coupons').send({
      welderId: world.weldersA[0]!.id,
      coupon: {
        code: 'asme-ix',
        process: 'SMAW',
        form: 'plate',
        weld: 'groove',
        position: '3G',
        thickness: { value: 1e308, unit: 'mm' },
        backing: true,
      },
    });
    expect(res.status).toBe(400);
    expect(Object.keys(errorOf(res).fields ?? {}).some((f) => f.endsWith('thickness.value'))).toBe(true);
  });

  it('keeps a 300-emoji file name whole to the last pair and drops direction overrides', async () => {
    const png = Buffer.from(
      'iVBORw0KGgoAAAANSUhEUgAAAAEAAAABCAYAAAAfFcSJAAAADUlEQVR42mP8z8BQDwAEhQGAhKmMIQAAAABJRU5ErkJggg==',
      'base64',
    );
    const long = `${'😀'.repeat(300)}.png`;
    const res = await qa.post('/api/uploads').field('kind', 'other').attach('file', png, long);
    expect(res.status).toBe(201);
    const name = (res.body as { fileName: string }).fileName;
    expect(name.length).toBeLessThanOrEqual(255);
    expect(name).toBe('😀'.repeat(127));
    const bidi = await qa.post('/api/uploads').field('kind', 'other').attach('file', png, 'photo\u202Egnp.exe');
    expect(bidi.status).toBe(201);
    expect((bidi.body as { fileName: string }).fileName).toBe('photognp.exe');
  });
});
