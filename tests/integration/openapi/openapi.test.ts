import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import request from 'supertest';
import { Ajv2020 } from 'ajv/dist/2020.js';
import { signIn, startTestApi, type TestApi } from '../../support/api-app.js';
import { makeWorld, TEST_PASSWORD } from '../../support/factories.js';
import { servedRoutes } from '../../support/express-routes.js';

interface Operation {
  requestBody?: { content: Record<string, { schema?: unknown }> };
  responses: Record<string, { content?: Record<string, { schema?: unknown }> }>;
  parameters?: { name: string; in: string }[];
}
interface Doc {
  openapi: string;
  paths: Record<string, Record<string, Operation>>;
}

const openApiPath = (p: string) => p.replace(/:(\w+)/g, '{$1}');
// Writes that take no body by design: the action is the whole request.
const BODILESS = new Set([
  'post /auth/logout',
  'post /auth/sessions/end-others',
  'post /people/:id/invitation',
  'post /welders/:id/account',
  'post /welders/:id/verify-token',
  'delete /welders/:id/verify-token',
  'post /api-tokens/:id/revoke',
  'post /imports/:id/commit',
  'post /imports/:id/cancel',
]);

describe('GET /api/openapi.json', () => {
  let api: TestApi;
  let doc: Doc;
  beforeAll(async () => {
    api = await startTestApi();
    const res = await request(api.app).get('/api/openapi.json').expect(200);
    doc = res.body as Doc;
  });
  afterAll(() => api.close());

  it('is OpenAPI 3.1', () => {
    expect(doc.openapi).toBe('3.1.0');
  });

  it('describes every route the API router serves, with its parameters, request and response schema', () => {
    const routes = servedRoutes(api.app, '/api');
    expect(routes.length).toBeGreaterThan(60);
    const missing: string[] = [];
    for (const r of routes) {
      const op = doc.paths[openApiPath(r.path)]?.[r.method];
      if (!op) {
        missing.push(`${r.method.toUpperCase()} /api${r.path}: not described`);
        continue;
      }
      const success = Object.entries(op.responses).filter(([s]) => s.startsWith('2'));
      if (success.length !== 1) missing.push(`${r.method} ${r.path}: no single success response`);
      for (const [s, resp] of success)
        if (s !== '204' && !Object.values(resp.content ?? {}).some((c) => c.schema))
          missing.push(`${r.method} ${r.path}: success response without a schema`);
      if (['post', 'put', 'patch'].includes(r.method) && !BODILESS.has(`${r.method} ${r.path}`))
        if (!Object.values(op.requestBody?.content ?? {}).some((c) => c.schema))
          missing.push(`${r.method} ${r.path}: no request body schema`);
      for (const name of [...r.path.matchAll(/:(\w+)/g)].map((m) => m[1]))
        if (!op.parameters?.some((p) => p.in === 'path' && p.name === name))
          missing.push(`${r.method} ${r.path}: path parameter ${name} not described`);
    }
    expect(missing).toEqual([]);
  });

  it('describes no route the router does not serve', () => {
    const served = new Set(servedRoutes(api.app, '/api').map((r) => `${r.method} ${openApiPath(r.path)}`));
    const extra = Object.entries(doc.paths).flatMap(([p, ops]) =>
      Object.keys(ops)
        .map((m) => `${m} ${p}`)
        .filter((k) => !served.has(k)),
    );
    expect(extra).toEqual([]);
  });

  it('real answers of a sample of routes validate against the described response schemas', async () => {
    const world = await makeWorld(api.ds);
    const qa = await signIn(api.app, world.qa.email, TEST_PASSWORD);
    const ajv = new Ajv2020({ strict: false, validateFormats: false, allErrors: true });
    const samples: [string, string, string][] = [
      ['/api/me', '/me', '200'],
      ['/api/welders?status=all', '/welders', '200'],
      [`/api/welders/${world.weldersA[0]!.id}`, '/welders/{id}', '200'],
      ['/api/shops', '/shops', '200'],
      [`/api/shops/${world.shopA.id}`, '/shops/{id}', '200'],
      ['/api/people', '/people', '200'],
      ['/api/audit', '/audit', '200'],
      ['/api/overview', '/overview', '200'],
      ['/api/settings', '/settings', '200'],
      ['/api/qualifications', '/qualifications', '200'],
      ['/api/coupons', '/coupons', '200'],
      ['/api/procedures', '/procedures', '200'],
      [`/api/continuity/grid?shopId=${world.shopA.id}&month=2026-01`, '/continuity/grid', '200'],
      ['/api/lapse-watch/runs', '/lapse-watch/runs', '200'],
      ['/api/api-tokens', '/api-tokens', '200'],
      ['/api/health', '/health', '200'],
    ];
    const failures: string[] = [];
    for (const [url, path, status] of samples) {
      const res = await qa.get(url);
      expect(res.status, url).toBe(Number(status));
      const schema = doc.paths[path]!.get!.responses[status]!.content!['application/json']!.schema as object;
      const validate = ajv.compile(schema);
      if (!validate(res.body)) failures.push(`${url}: ${ajv.errorsText(validate.errors)}`);
    }
    // A write, too: the created welder as the description says it comes back.
    const created = await qa.post('/api/welders').send({ stamp: 'OA-1', name: 'Ola Anker', homeShopId: world.shopA.id });
    const schema = doc.paths['/welders']!.post!.responses['201']!.content!['application/json']!.schema as object;
    const validate = ajv.compile(schema);
    if (!validate(created.body)) failures.push(`POST /api/welders: ${ajv.errorsText(validate.errors)}`);
    expect(failures).toEqual([]);
  });

  it('a wrong answer does not validate (the check can fail)', () => {
    const ajv = new Ajv2020({ strict: false, validateFormats: false });
    const schema = doc.paths['/welders']!.get!.responses['200']!.content!['application/json']!.schema as object;
    expect(ajv.validate(schema, { items: [{ stamp: 7 }], total: 'x' })).toBe(false);
  });
});
