import { execFile } from 'node:child_process';
import { fileURLToPath } from 'node:url';
import { promisify } from 'node:util';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { meSchema } from '@beadroll/rules';
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

describe('the demo seed', () => {
  let api: TestApi;
  beforeAll(async () => {
    api = await startTestApi();
  });
  afterAll(() => api.close());

  it('runs twice without duplicating anything', async () => {
    await seedDemo(api.ds, api.config);
    const once = await demoCounts(api);
    expect(once).toEqual({ orgs: 2, shops: 3, welders: 40, users: 4, assignments: 2 });
    const second = await seedDemo(api.ds, api.config);
    expect(second.created).toEqual({ organizations: 0, shops: 0, welders: 0, users: 0 });
    expect(await demoCounts(api)).toEqual(once);
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
        env: { ...process.env, NODE_ENV: 'production', JWT_SECRET: 'x'.repeat(40), PGPORT: '1' },
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
