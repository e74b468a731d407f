import request from 'supertest';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { couponRecordSchema, verifySchema } from '@beadroll/rules';
import { bodyOf, errorOf, signIn, startTestApi, type TestApi } from '../../support/api-app.js';
import { auditRows, makeWorld, TEST_PASSWORD } from '../../support/factories.js';
import { couponBody, daysAgo, makeProcedure } from '../../support/api-records.js';

describe('the public verify page', () => {
  let api: TestApi;
  beforeAll(async () => {
    api = await startTestApi({ config: { verifyRateLimit: 5 } });
  });
  afterAll(() => api.close());

  async function welderWithQualification() {
    const world = await makeWorld(api.ds);
    const wps = await makeProcedure(api.ds, world.org, { number: 'V-1' });
    const qa = await signIn(api.app, world.qa.email, TEST_PASSWORD);
    const welder = world.weldersA[0]!;
    const c = bodyOf(
      couponRecordSchema,
      await qa
        .post('/api/coupons')
        .send(couponBody({ welderId: welder.id, shopId: world.shopA.id, procedureId: wps.id }))
        .expect(201),
    );
    await qa
      .post(`/api/coupons/${c.id}/certify`)
      .send({ certifiedOn: daysAgo(8), version: 1 })
      .expect(201);
    return { world, qa, welder };
  }

  it('shows name, stamp, company and each qualification without a cookie, and nothing else', async () => {
    const { world, qa, welder } = await welderWithQualification();
    const issued = await qa.post(`/api/welders/${welder.id}/verify-token`).expect(201);
    const url = (issued.body as { url: string }).url;
    expect(url).toMatch(new RegExp(`^${api.config.appUrl}/verify/[A-Za-z0-9_-]{43}$`));
    const token = url.split('/').pop()!;
    const res = await request(api.app).get(`/api/verify/${token}`).expect(200);
    const view = bodyOf(verifySchema.strict(), res);
    expect(view).toMatchObject({ welder: { name: 'Ada Quenby', stamp: 'A-01' }, company: world.org.name });
    expect(view.qualifications).toEqual([
      expect.objectContaining({ code: 'asme-ix', process: 'SMAW', state: 'current' }),
    ]);
    expect(view.qualifications[0]!.summary).toContain('1 in OD and over');
    expect(view.notice).toMatch(/code edition in force/);
    const raw = JSON.stringify(res.body);
    expect(raw).not.toContain('@');
    expect(raw).not.toMatch(/[0-9a-f]{8}-[0-9a-f]{4}-/);
    expect(raw).not.toContain(welder.id);
    const [row] = await api.ds.query<{ tokenHash: string }[]>(
      `SELECT token_hash AS "tokenHash" FROM verify_tokens WHERE welder_id = $1`,
      [welder.id],
    );
    expect(row!.tokenHash).not.toContain(token);
  });

  it('never issues a link when a card or WPQ is downloaded; the status gives the live link and the documents printing it', async () => {
    const { qa, welder } = await welderWithQualification();
    const [q] = ((await qa.get(`/api/qualifications?welderId=${welder.id}`).expect(200)).body as { items: { id: string; number: string }[] }).items;
    await qa.get(`/api/welders/${welder.id}/card.pdf`).expect(200);
    await qa.get(`/api/qualifications/${q!.id}/wpq.pdf`).expect(200);
    const rows = await api.ds.query<{ n: number }[]>(`SELECT count(*)::int AS n FROM verify_tokens WHERE welder_id = $1`, [welder.id]);
    expect(rows[0]!.n).toBe(0);
    expect((await qa.get(`/api/welders/${welder.id}/verify-token`).expect(200)).body).toEqual({
      active: false,
      issuedAt: null,
      url: null,
      printedOn: [],
    });
    const issued = (await qa.post(`/api/welders/${welder.id}/verify-token`).expect(201)).body as { url: string };
    await qa.get(`/api/welders/${welder.id}/card.pdf`).expect(200);
    const status = (await qa.get(`/api/welders/${welder.id}/verify-token`).expect(200)).body as Record<string, unknown>;
    expect(status).toMatchObject({ active: true, url: issued.url });
    expect(status.printedOn).toEqual(['the wallet card', `the WPQ record ${q!.number} (ASME IX SMAW)`]);
    expect((await auditRows(api.ds, welder.id)).map((a) => a.action)).toEqual(['verify-token.issued']);
  });

  it('stops the old link after a reissue and after revocation (410, no longer valid); a link never issued is 404, not found', async () => {
    const { qa, welder } = await welderWithQualification();
    const first = (
      (await qa.post(`/api/welders/${welder.id}/verify-token`).expect(201)).body as { url: string }
    ).url
      .split('/')
      .pop()!;
    const second = (
      (await qa.post(`/api/welders/${welder.id}/verify-token`).expect(201)).body as { url: string }
    ).url
      .split('/')
      .pop()!;
    const old = await request(api.app).get(`/api/verify/${first}`);
    expect(old.status).toBe(410);
    expect(errorOf(old).message).toBe('This card is no longer valid');
    await request(api.app).get(`/api/verify/${second}`).expect(200);
    await qa.delete(`/api/welders/${welder.id}/verify-token`).expect(204);
    expect((await request(api.app).get(`/api/verify/${second}`)).status).toBe(410);
    // One character changed, cut short, or made up: not found — never reported as revoked (read from an
    // instance of its own, as the checks above used up this one's allowance per address).
    const fresh = await startTestApi();
    try {
      const typo = `${second.slice(0, -1)}${second.endsWith('A') ? 'B' : 'A'}`;
      for (const token of [typo, second.slice(0, 20), 'x'.repeat(43)]) {
        const res = await request(fresh.app).get(`/api/verify/${token}`);
        expect(res.status).toBe(404);
        expect(errorOf(res).message).toBe('No card was found for this link');
      }
    } finally {
      await fresh.close();
    }
    expect((await qa.get(`/api/welders/${welder.id}/verify-token`).expect(200)).body).toEqual({
      active: false,
      issuedAt: null,
      url: null,
      printedOn: [],
    });
    expect((await auditRows(api.ds, welder.id)).map((a) => a.action)).toEqual([
      'verify-token.issued',
      'verify-token.reissued',
      'verify-token.revoked',
    ]);
  });

  it('is rate-limited per client address (429)', async () => {
    const app = await startTestApi({ config: { verifyRateLimit: 3 } });
    try {
      const codes: number[] = [];
      for (let i = 0; i < 5; i++)
        codes.push((await request(app.app).get(`/api/verify/${'x'.repeat(43)}`)).status);
      expect(codes).toEqual([404, 404, 404, 429, 429]);
    } finally {
      await app.close();
    }
  });
});
