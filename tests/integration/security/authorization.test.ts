// Authorization as data. Every route the API router serves declares who may call it — public, any
// signed-in caller, or a person only, and which roles — in apps/api/src/openapi/route-docs.ts, beside
// the schemas of its handler. This test enumerates the router, refuses a route without a declaration,
// and generates route × caller × target cases from the declarations: two companies; a QA manager; a
// foreman with a welder in their shop and one out of it; a welder for themself and for another welder;
// and no sign-in at all. Each case must give the declared outcome: 401 signed out, 403 for a role not
// declared, 404 for another company's record (or a welder or shop outside the caller's scope), and
// never one of those for a caller the declaration lets in. (A write whose body is checked before its
// target is looked up may answer 400 to another company's id: that tells nothing either.)
import { randomUUID } from 'node:crypto';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import request from 'supertest';
import { allRouteDocs, type RouteDoc } from '../../../apps/api/src/openapi/route-docs.js';
import { servedRoutes } from '../../support/express-routes.js';
import { signIn, startTestApi, type TestApi } from '../../support/api-app.js';
import { makeOtherCompany, makeWorld, TEST_PASSWORD } from '../../support/factories.js';
import { makeProcedure } from '../../support/api-records.js';

type Caller = 'signed-out' | 'qa' | 'foreman' | 'welder';
/** Where a route's :id points, relative to the caller. */
type Target = 'own' | 'out-of-scope' | 'other-company';
interface Case {
  route: RouteDoc;
  caller: Caller;
  target: Target | null;
  path: string;
  expect: 'allowed' | 401 | 403 | 404;
}

// Routes whose call would end the caller's own session; checked in sessions.test.ts.
const SKIP = new Set(['post /auth/logout', 'post /auth/sessions/end-others']);

describe('authorization as data', () => {
  let api: TestApi;
  const agents = new Map<Caller, ReturnType<typeof request.agent> | null>();
  const ids = new Map<string, Record<Target, string | null>>();
  const cases: Case[] = [];

  beforeAll(async () => {
    api = await startTestApi();
    const a = await makeWorld(api.ds);
    const b = await makeOtherCompany(api.ds);
    const procA = await makeProcedure(api.ds, a.org, { number: 'WPS-AUTHZ' });
    const procB = await makeProcedure(api.ds, b.org, { number: 'WPS-AUTHZ' });
    const otherUser = b.qa.id;
    // :id by the first path segment. 'own' is in the caller's scope (the welder's own record, the
    // foreman's shop); 'out-of-scope' is the same company but outside a foreman's shop or another welder.
    ids.set('welders', { own: a.weldersA[0]!.id, 'out-of-scope': a.weldersB[0]!.id, 'other-company': b.welder.id });
    ids.set('shops', { own: a.shopA.id, 'out-of-scope': a.shopB.id, 'other-company': b.shop.id });
    ids.set('people', { own: a.foreman.id, 'out-of-scope': null, 'other-company': otherUser });
    ids.set('procedures', { own: procA.id, 'out-of-scope': null, 'other-company': procB.id });
    agents.set('signed-out', null);
    agents.set('qa', await signIn(api.app, a.qa.email, TEST_PASSWORD));
    // A production weld in the foreman's shop and one outside it (any welder may weld in any shop).
    const weldIn = async (shopId: string, ds = api.ds, org = a.org.id) => {
      const [w] = await ds.query<{ id: string }[]>(
        `INSERT INTO welds (organization_id, shop_id, job_reference, weld_number, welded_on, joint, checked_at, rules_version)
         VALUES ($1, $2, 'AUTHZ', gen_random_uuid()::text, current_date, '{}', now(), 'test') RETURNING id`,
        [org, shopId],
      );
      return w!.id;
    };
    ids.set('welds', { own: await weldIn(a.shopA.id), 'out-of-scope': await weldIn(a.shopB.id), 'other-company': await weldIn(b.shop.id, api.ds, b.org.id) });
    agents.set('foreman', await signIn(api.app, a.foreman.email, TEST_PASSWORD));
    agents.set('welder', await signIn(api.app, a.welder.email, TEST_PASSWORD));

    const docs = new Map(allRouteDocs().map((d) => [`${d.method} ${d.path}`, d]));
    for (const served of servedRoutes(api.app, '/api')) {
      const key = `${served.method} ${served.path}`;
      const route = docs.get(key);
      if (!route) throw new Error(`${key.toUpperCase()} has no declaration: add it to apps/api/src/openapi/route-docs.ts`);
      if (SKIP.has(key)) continue;
      const param = /:(\w+)/.exec(route.path);
      const kind = route.path.split('/')[1] ?? '';
      const targets: (Target | null)[] = param ? ['own', 'out-of-scope', 'other-company'] : [null];
      for (const caller of agents.keys())
        for (const target of targets) {
          const known = ids.get(kind);
          const id = target === null ? null : known ? known[target] : target === 'other-company' ? randomUUID() : null;
          if (target !== null && id === null) continue;
          const path = `/api${param && id ? route.path.replace(`:${param[1]}`, id) : route.path}`;
          cases.push({ route, caller, target, path, expect: expected(route, caller, target, kind) });
        }
    }
  }, 60_000);
  afterAll(() => api.close());

  function expected(route: RouteDoc, caller: Caller, target: Target | null, kind: string): Case['expect'] {
    if (route.access === 'public') return 'allowed';
    if (caller === 'signed-out') return 401;
    if (route.roles && !route.roles.includes(caller === 'qa' ? 'qa_manager' : caller)) return 403;
    if (target === 'other-company') return 404;
    // A foreman reads the welders and shops of their shops; a welder only their own welder file.
    // Production welds: a foreman's are those of their shops.
    if (target === 'out-of-scope' && (kind === 'welders' || kind === 'welds' || (kind === 'shops' && route.method === 'get')))
      return caller === 'qa' ? 'allowed' : 404;
    return 'allowed';
  }

  it('declares every route and gives every generated case its declared outcome', async () => {
    expect(cases.length).toBeGreaterThan(300);
    const wrong: string[] = [];
    for (const c of cases) {
      const agent = agents.get(c.caller) ?? request(api.app);
      const send = agent[c.route.method](c.path);
      const res = c.route.method === 'get' || c.route.method === 'delete' ? await send : await send.send({});
      const ok =
        c.expect === 'allowed'
          ? ![401, 403].includes(res.status) && !(c.target !== null && c.route.access !== 'public' && res.status === 404 && ids.has(c.path.split('/')[2] ?? ''))
          : res.status === c.expect ||
            // A write with a body is checked before its target is looked up: a 400 tells nothing either.
            (c.expect === 404 && c.route.method !== 'get' && c.route.method !== 'delete' && res.status === 400);
      if (!ok || res.status >= 500)
        wrong.push(`${c.route.method.toUpperCase()} ${c.path} as ${c.caller} (${c.target ?? 'no target'}): ${res.status}, expected ${c.expect}`);
    }
    console.log(`authorization cases: ${cases.length}`);
    expect(wrong).toEqual([]);
  }, 240_000);
});
