import { execFile } from 'node:child_process';
import { fileURLToPath } from 'node:url';
import { promisify } from 'node:util';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { meSchema, qualificationSchema } from '@beadroll/rules';
import { z } from 'zod';
import { DEMO_ACCOUNTS, DEMO_PASSWORD, seedDemo } from '../../../apps/api/src/db/seed.js';
import { bodyOf, signIn, startTestApi, type TestApi } from '../../support/api-app.js';

const root = fileURLToPath(new URL('../../../', import.meta.url));

async function demoCounts(api: TestApi) {
  const [row] = await api.ds.query<
    {
      orgs: number;
      shops: number;
      welders: number;
      users: number;
      assignments: number;
    }[]
  >(`
    SELECT (SELECT count(*)::int FROM organizations WHERE name IN ('Harrow Point Fabrication', 'Dunmore Kettle Works')) AS orgs,
           (SELECT count(*)::int FROM shops s JOIN organizations o ON o.id = s.organization_id WHERE o.name = 'Harrow Point Fabrication') AS shops,
           (SELECT count(*)::int FROM welders w JOIN organizations o ON o.id = w.organization_id WHERE o.name = 'Harrow Point Fabrication') AS welders,
           (SELECT count(*)::int FROM users WHERE email LIKE '%@beadroll-demo.example') AS users,
           (SELECT count(*)::int FROM foreman_shops fs JOIN users u ON u.id = fs.user_id WHERE u.email = 'foreman@beadroll-demo.example') AS assignments`);
  return row!;
}

async function recordCounts(api: TestApi) {
  const [row] = await api.ds.query<
    {
      procedures: number;
      superseded: number;
      coupons: number;
      qualifications: number;
      uploads: number;
      tokens: number;
    }[]
  >(`
    WITH o AS (SELECT id FROM organizations WHERE name = 'Harrow Point Fabrication')
    SELECT (SELECT count(*)::int FROM procedures WHERE organization_id IN (SELECT id FROM o)) AS procedures,
           (SELECT count(*)::int FROM procedures WHERE organization_id IN (SELECT id FROM o) AND status = 'superseded') AS superseded,
           (SELECT count(*)::int FROM coupons WHERE organization_id IN (SELECT id FROM o)) AS coupons,
           (SELECT count(*)::int FROM qualifications WHERE organization_id IN (SELECT id FROM o)) AS qualifications,
           (SELECT count(*)::int FROM uploads WHERE organization_id IN (SELECT id FROM o)) AS uploads,
           (SELECT count(*)::int FROM verify_tokens WHERE organization_id IN (SELECT id FROM o) AND revoked_at IS NULL) AS tokens`);
  return row!;
}

describe('the demo seed', () => {
  let api: TestApi;
  beforeAll(async () => {
    api = await startTestApi();
  });
  afterAll(() => api.close());

  it('runs twice without duplicating anything', async () => {
    await seedDemo(api.ds, api.config);
    const once = await demoCounts(api);
    const records = await recordCounts(api);
    expect(once).toEqual({ orgs: 2, shops: 3, welders: 40, users: 4, assignments: 2 });
    const second = await seedDemo(api.ds, api.config);
    expect(second.created).toEqual({
      organizations: 0,
      shops: 0,
      welders: 0,
      users: 0,
      procedures: 0,
      coupons: 0,
      qualifications: 0,
      uploads: 0,
      continuityEntries: 0,
      revocations: 0,
      renewals: 0,
      welds: 0,
    });
    expect(await demoCounts(api)).toEqual(once);
    expect(await recordCounts(api)).toEqual(records);
  });

  it('has two jobs of production welds, exactly one flagged with its reason and clause', async () => {
    await seedDemo(api.ds, api.config);
    const jobs = await api.ds.query<{ job: string; welds: number; flagged: number }[]>(
      `SELECT job_reference AS job, count(*)::int AS welds, count(*) FILTER (WHERE flagged)::int AS flagged
         FROM welds w JOIN organizations o ON o.id = w.organization_id
        WHERE o.name = 'Harrow Point Fabrication' GROUP BY 1 ORDER BY 1`,
    );
    expect(jobs).toEqual([
      { job: 'HPF-2433', welds: 6, flagged: 1 },
      { job: 'TRV-131', welds: 5, flagged: 0 },
    ]);
    const [reason] = await api.ds.query<{ reasons: { variable: string; clause: string }[] }[]>(
      `SELECT p.reasons FROM weld_passes p JOIN welds w ON w.id = p.weld_id WHERE w.flagged AND w.weld_number = 'N5'`,
    );
    expect(reason!.reasons.map((r) => r.variable)).toContain('thickness');
  });

  it('gives every demo account its role and shops', async () => {
    await seedDemo(api.ds, api.config);
    const me = async (email: string) =>
      bodyOf(meSchema, await (await signIn(api.app, email, DEMO_PASSWORD)).get('/api/me').expect(200));
    const qa = await me(DEMO_ACCOUNTS.qa);
    expect(qa).toMatchObject({
      role: 'qa_manager',
      name: 'Morgan Adeyemi-Clarke',
      organization: { name: 'Harrow Point Fabrication' },
    });
    expect(qa.shops.map((s) => s.code)).toEqual(['PL', 'PV', 'ST']);
    const foreman = await me(DEMO_ACCOUNTS.foreman);
    expect(foreman).toMatchObject({ role: 'foreman', name: 'Rowan Castellanos' });
    expect(foreman.shops.map((s) => s.code)).toEqual(['PV', 'ST']);
    const welder = await me(DEMO_ACCOUNTS.welder);
    expect(welder).toMatchObject({ role: 'welder', name: 'Jesse Okonkwo-Lind', shops: [{ code: 'PV' }] });
    const [w] = await api.ds.query<{ stamp: string }[]>(`SELECT stamp FROM welders WHERE id = $1`, [
      welder.welderId,
    ]);
    expect(w?.stamp).toBe('PV-07');
    const other = await me(DEMO_ACCOUNTS.otherCompanyQa);
    expect(other.organization.name).toBe('Dunmore Kettle Works');
  });

  it('gives every demo welder one to four coupons of their shop’s codes, passes certified, a few rejects, and PV-07 a verify token', async () => {
    await seedDemo(api.ds, api.config);
    const records = await recordCounts(api);
    expect(records).toMatchObject({ procedures: 8, superseded: 1, uploads: 3, tokens: 1 });
    const perWelder = await api.ds.query<
      { stamp: string; n: number; codes: string[]; rejects: number; certified: number; passes: number }[]
    >(`
      SELECT w.stamp, count(c.id)::int AS n, array_agg(DISTINCT c.code) AS codes,
             count(*) FILTER (WHERE c.result = 'reject')::int AS rejects,
             count(q.id)::int AS certified, count(*) FILTER (WHERE c.result = 'accept')::int AS passes
        FROM welders w JOIN organizations o ON o.id = w.organization_id AND o.name = 'Harrow Point Fabrication'
        LEFT JOIN coupons c ON c.welder_id = w.id LEFT JOIN qualifications q ON q.coupon_id = c.id
       GROUP BY w.stamp`);
    expect(perWelder).toHaveLength(40);
    const codeOf: Record<string, string> = { PV: 'asme-ix', ST: 'aws-d1.1', PL: 'api-1104' };
    for (const w of perWelder) {
      expect(w.n).toBeGreaterThanOrEqual(1);
      expect(w.n).toBeLessThanOrEqual(4);
      expect(w.codes).toEqual([codeOf[w.stamp.slice(0, 2)]]);
      expect(w.certified).toBe(w.passes);
    }
    expect(perWelder.reduce((a, w) => a + w.rejects, 0)).toBeGreaterThanOrEqual(3);
    const qa = await signIn(api.app, DEMO_ACCOUNTS.welder, DEMO_PASSWORD);
    const mine = (await qa.get('/api/qualifications').expect(200)).body as {
      items: { status: { state: string } }[];
    };
    expect(mine.items.length).toBeGreaterThanOrEqual(2);
    expect(mine.items.every((q) => q.status.state === 'current')).toBe(true);
    const me = bodyOf(meSchema, await qa.get('/api/me').expect(200));
    const card = await qa.get(`/api/welders/${me.welderId}/card.pdf`).expect(200);
    expect(card.headers['content-type']).toBe('application/pdf');
  });

  it('shapes the continuity history relative to today: current, lapsing within 30 days, lapsed, revoked, renewed', async () => {
    await seedDemo(api.ds, api.config);
    const qa = await signIn(api.app, DEMO_ACCOUNTS.qa, DEMO_PASSWORD);
    const { items } = bodyOf(z.object({ items: z.array(qualificationSchema) }), await qa.get('/api/qualifications').expect(200));
    const inState = (state: string) => items.filter((q) => q.status.state === state);
    expect(inState('current').length).toBeGreaterThan(items.length / 2); // a working company: most are current
    const lapsing = inState('lapsing');
    expect(lapsing.length).toBeGreaterThanOrEqual(1);
    for (const q of lapsing) expect(q.status.daysLeft).toBeGreaterThan(0);
    expect(lapsing.some((q) => q.status.daysLeft <= 30)).toBe(true);
    // One or two working welders lapsed (welders who left the company lapse too, and are not counted).
    const left = new Set(
      (await api.ds.query<{ id: string }[]>(`SELECT id FROM welders WHERE NOT active`)).map((w) => w.id),
    );
    const lapsedWelders = new Set(inState('lapsed').filter((q) => !left.has(q.welder.id)).map((q) => q.welder.id));
    expect(lapsedWelders.size).toBeGreaterThanOrEqual(1);
    expect(lapsedWelders.size).toBeLessThanOrEqual(2);
    const revoked = inState('revoked');
    expect(revoked).toHaveLength(1);
    expect(revoked[0]!.revokedReason).toMatch(/\w/);
    // Logged use in the demo: the history of the current welders runs month by month up to this month.
    const [logged] = await api.ds.query<{ entries: number; thisMonth: number }[]>(
      `SELECT count(*)::int AS entries,
              count(*) FILTER (WHERE e.month = date_trunc('month', current_date)::date)::int AS "thisMonth"
         FROM continuity_entries e JOIN organizations o ON o.id = e.organization_id AND o.name = 'Harrow Point Fabrication'`,
    );
    expect(logged!.entries).toBeGreaterThan(100);
    expect(logged!.thisMonth).toBeGreaterThan(10);
    // Renewed: a pair that lapsed for lack of use and a passing coupon after it, now current again.
    const [renewed] = await api.ds.query<{ welderId: string; process: string; code: string }[]>(
      `SELECT s.welder_id AS "welderId", s.process, s.code FROM continuity_states s
         JOIN organizations o ON o.id = s.organization_id AND o.name = 'Harrow Point Fabrication'
        WHERE s.renewed_on IS NOT NULL`,
    );
    expect(renewed).toBeDefined();
    const renewedQualifications = items.filter(
      (q) => q.welder.id === renewed!.welderId && q.process === renewed!.process && q.code === renewed!.code,
    );
    expect(renewedQualifications.length).toBeGreaterThanOrEqual(2); // the lapsed one and the retest's
    expect(renewedQualifications.every((q) => q.status.state === 'current')).toBe(true);
    const timeline = (await qa.get(`/api/welders/${renewed!.welderId}/timeline`).expect(200)).body as {
      processes: { process: string; code: string; events: { kind: string }[] }[];
    };
    const kinds = timeline.processes
      .find((p) => p.process === renewed!.process && p.code === renewed!.code)
      ?.events.map((e) => e.kind);
    expect(kinds?.indexOf('lapse')).toBeGreaterThanOrEqual(0);
    expect(kinds?.indexOf('renewal')).toBeGreaterThan(kinds?.indexOf('lapse') ?? Infinity);
    // The stored states agree with a full recompute.
    // Scoped to the demo company: other test files write hand-made states of their own companies into
    // the same database.
    const { differingStates } = await import('../../../apps/api/src/continuity/continuity-state.repository.js');
    const demoWelders = new Set(
      (
        await api.ds.query<{ id: string }[]>(
          `SELECT w.id FROM welders w JOIN organizations o ON o.id = w.organization_id
            WHERE o.name = 'Harrow Point Fabrication'`,
        )
      ).map((w) => w.id),
    );
    expect((await differingStates(api.ds.manager)).filter((d) => demoWelders.has(d.welderId))).toEqual([]);
  });

  it('refuses production: NODE_ENV=production or a database named *_prod', async () => {
    await expect(seedDemo(api.ds, { ...api.config, nodeEnv: 'production' })).rejects.toThrow(/production/);
    await expect(
      seedDemo(api.ds, { ...api.config, db: { ...api.config.db, database: 'beadroll_prod' } }),
    ).rejects.toThrow(/production/);
  });

  it('refuses production from the command line too, before touching the database', async () => {
    const run = promisify(execFile);
    const attempt = run(
      process.execPath,
      [`${root}node_modules/tsx/dist/cli.mjs`, 'apps/api/src/db/seed.ts'],
      {
        cwd: root,
        env: {
          ...process.env,
          // A production configuration complete enough to start (config.ts refuses less).
          NODE_ENV: 'production',
          JWT_SECRET: 'x'.repeat(40),
          APP_URL: 'https://beadroll.example.com',
          SMTP_HOST: 'smtp.example.com',
          S3_ENDPOINT: 'https://s3.example.com',
          S3_ACCESS_KEY_ID: 'AKIAEXAMPLE',
          S3_SECRET_ACCESS_KEY: 's'.repeat(40),
          PGPORT: '1',
        },
      },
    );
    const failure = await attempt.then(
      () => null,
      (err: unknown) => err as { code: number; stderr: string },
    );
    expect(failure?.code).toBe(1);
    expect(failure?.stderr).toMatch(/Refusing to seed demo data/);
  });
});
