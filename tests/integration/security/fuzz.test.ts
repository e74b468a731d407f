// Fuzzing every route (issue 11): fast-check draws a route the API router serves, a caller, path
// parameters (own records, unknown ids, hostile text, broken percent-encoding), a query string, headers
// and a body (the route's own fields with values of every wrong type and hostile strings, or a raw body
// that is not what its content type says). Whatever is sent, the answer is never a 5xx; a 400 is the
// JSON error body and, when it is about the input, names the field; and a refused request writes
// nothing (row counts of every table of the company, the audit trail included, are unchanged).
// `npm test` runs a bounded number of cases (FUZZ_RUNS, default 2,000); `npm run fuzz` runs 100,000.
import fc from 'fast-check';
import request from 'supertest';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { z } from 'zod';
import { errorBodySchema } from '@beadroll/rules';
import { allRouteDocs, type RouteDoc } from '../../../apps/api/src/openapi/route-docs.js';
import { servedRoutes } from '../../support/express-routes.js';
import { signIn, startTestApi, type TestApi } from '../../support/api-app.js';
import { makeOtherCompany, makeWorld, TEST_PASSWORD } from '../../support/factories.js';
import { makeProcedure } from '../../support/api-records.js';

const RUNS = Number(process.env.FUZZ_RUNS ?? 2000);
const SEED = process.env.FUZZ_SEED ? Number(process.env.FUZZ_SEED) : undefined;
// Routes that would end the fuzzing callers' own sessions (covered in sessions.test.ts).
const SKIP = new Set(['post /auth/logout', 'post /auth/sessions/end-others', 'delete /auth/sessions/:id']);

const hostile = fc.constantFrom(
  '',
  ' ',
  '\u0000',
  'a\u0000b',
  '\uD800',
  'x\uDC00y',
  '\u202Egnp.exe',
  '\u001b[31m',
  '%E0%A4%A',
  '../../etc/passwd',
  "' OR 1=1 --",
  '<script>alert(1)</script>',
  '1e308',
  '-1',
  'NaN',
  'Infinity',
  '2026-02-30',
  '9999-99-99',
  '00000000-0000-0000-0000-000000000000',
  '１２３',
  '🔥'.repeat(300),
  'x'.repeat(5000),
  '__proto__',
  'constructor',
  'null',
  '{}',
);
const scalar = fc.oneof(
  hostile,
  fc.string({ unit: 'binary', maxLength: 40 }),
  fc.integer(),
  fc.double(),
  fc.constantFrom(1e308, -1e308, Number.MAX_SAFE_INTEGER + 2, 0, -0),
  fc.boolean(),
  fc.constant(null),
);
const value: fc.Arbitrary<unknown> = fc.oneof(
  { weight: 6, arbitrary: scalar },
  { weight: 1, arbitrary: fc.array(scalar, { maxLength: 4 }) },
  { weight: 1, arbitrary: fc.dictionary(fc.string({ maxLength: 8 }), scalar, { maxKeys: 3 }) },
);

/** The field names of a zod schema's object, one level into nested objects and arrays of objects. */
function fieldsOf(schema: z.ZodType | undefined): { key: string; nested: string[] }[] {
  let s: unknown = schema;
  for (let i = 0; i < 6 && s && !(s instanceof z.ZodObject); i++) {
    const def = (s as { def?: { in?: unknown; innerType?: unknown; schema?: unknown } }).def;
    s = def?.in ?? def?.innerType ?? def?.schema;
  }
  if (!(s instanceof z.ZodObject)) return [];
  return Object.entries(s.shape as Record<string, z.ZodType>).map(([key, field]) => {
    let inner: unknown = field;
    for (let i = 0; i < 6 && inner && !(inner instanceof z.ZodObject); i++) {
      const def = (inner as { def?: { in?: unknown; innerType?: unknown; element?: unknown } }).def;
      inner = def?.innerType ?? def?.in ?? def?.element;
    }
    return { key, nested: inner instanceof z.ZodObject ? Object.keys(inner.shape) : [] };
  });
}

/** Percent-encodes every byte that is not unreserved, so any text can travel in a path or query. */
const encode = (s: string) =>
  [...Buffer.from(s, 'utf8')]
    .map((b) =>
      /[A-Za-z0-9\-._~]/.test(String.fromCharCode(b))
        ? String.fromCharCode(b)
        : `%${b.toString(16).toUpperCase().padStart(2, '0')}`,
    )
    .join('');

/** Any drawn value as text (objects from fc.dictionary may have no prototype). */
const text = (v: unknown): string => (typeof v === 'string' ? v : (JSON.stringify(v) ?? ''));

type Caller = 'signed-out' | 'qa' | 'foreman' | 'welder';

describe('fuzzing every route', () => {
  let api: TestApi;
  let world: Awaited<ReturnType<typeof makeWorld>>;
  const agents = new Map<Caller, ReturnType<typeof request.agent> | null>();
  const knownIds: string[] = [];
  let routes: RouteDoc[] = [];
  let snapshotSql = '';

  beforeAll(async () => {
    api = await startTestApi();
    world = await makeWorld(api.ds);
    const other = await makeOtherCompany(api.ds);
    const proc = await makeProcedure(api.ds, world.org, { number: 'WPS-FUZZ' });
    knownIds.push(
      world.shopA.id,
      world.shopB.id,
      world.weldersA[0]!.id,
      world.weldersB[0]!.id,
      world.foreman.id,
      proc.id,
      other.welder.id,
      other.shop.id,
    );
    agents.set('signed-out', null);
    agents.set('qa', await signIn(api.app, world.qa.email, TEST_PASSWORD));
    agents.set('foreman', await signIn(api.app, world.foreman.email, TEST_PASSWORD));
    agents.set('welder', await signIn(api.app, world.welder.email, TEST_PASSWORD));
    const docs = new Map(allRouteDocs().map((d) => [`${d.method} ${d.path}`, d]));
    routes = servedRoutes(api.app, '/api')
      .map((r) => docs.get(`${r.method} ${r.path}`))
      .filter((d): d is RouteDoc => d !== undefined && !SKIP.has(`${d.method} ${d.path}`));
    const tables = await api.ds.query<{ table_name: string }[]>(
      `SELECT table_name FROM information_schema.columns
        WHERE table_schema = 'public' AND column_name = 'organization_id' ORDER BY table_name`,
    );
    snapshotSql = `SELECT ${tables.map((t) => `(SELECT count(*) FROM ${t.table_name} WHERE organization_id = $1)::int AS "${t.table_name}"`).join(', ')}`;
  }, 60_000);
  afterAll(() => api.close());

  const snapshot = async () =>
    (await api.ds.query<Record<string, number>[]>(snapshotSql, [world.org.id]))[0]!;

  const caseArb = () =>
    fc.record({
      route: fc.constantFrom(...routes),
      caller: fc.constantFrom<Caller>('qa', 'qa', 'qa', 'foreman', 'welder', 'signed-out'),
      param: fc.oneof(
        fc.constantFrom(...knownIds),
        fc.uuid(),
        hostile.map(encode),
        fc.constantFrom('%E0%A4%A', '%', '%zz', '%C0%AF', '..%2F..', 'x'.repeat(600)),
      ),
      query: fc.dictionary(
        fc.oneof(
          fc.constantFrom(
            'q',
            'page',
            'shopId',
            'month',
            'status',
            'asOf',
            'process',
            'code',
            'entityType',
            'inline',
            'limit',
            'sort',
          ),
          fc.string({ maxLength: 6 }),
        ),
        value,
        { maxKeys: 4 },
      ),
      rawQuery: fc.option(
        fc.constantFrom('q=%E0%A4%A', 'q=%00', 'page=-1&page=2', 'a[b][c]=1', 'shopId[]=x', '%%%'),
        { nil: undefined },
      ),
      fieldPicks: fc.array(
        fc.tuple(fc.nat(), value, fc.option(fc.tuple(fc.nat(), value), { nil: undefined })),
        { maxLength: 6 },
      ),
      extra: fc.dictionary(fc.string({ unit: 'binary', maxLength: 10 }), value, { maxKeys: 2 }),
      bodyKind: fc.constantFrom(
        'json',
        'json',
        'json',
        'json',
        'raw-json',
        'text',
        'form',
        'multipart',
        'none',
      ),
      raw: fc.constantFrom(
        '{"a":',
        '[',
        'null',
        '"x"',
        '\u0000',
        '{"__proto__":{"admin":true}}',
        '--x\r\nContent-Disposition: form-data; name="file"; filename="a.pdf"\r\n\r\n%PDF-1.4',
        '',
      ),
      header: fc.constantFrom<[string, string] | null>(
        null,
        ['content-type', 'application/json; charset=koi8-r'],
        ['accept-language', '\u00ff'.repeat(10)],
        ['x-forwarded-for', 'not an address'],
        ['origin', 'null'],
        ['authorization', 'Bearer x'],
        ['content-encoding', 'gzip'],
      ),
    });

  it(
    `never answers 5xx, names the field of a refused input and writes nothing on refusal (${RUNS} cases)`,
    async () => {
      const failures: string[] = [];
      let cases = 0;
      await fc.assert(
        fc.asyncProperty(caseArb(), async (c) => {
          cases++;
          const fields = fieldsOf(c.route.body ?? c.route.multipart);
          const body: Record<string, unknown> = { ...c.extra };
          for (const [pick, v, nestedPick] of c.fieldPicks) {
            const field = fields[pick % Math.max(1, fields.length)];
            if (!field) continue;
            if (nestedPick && field.nested.length > 0) {
              const [np, nv] = nestedPick;
              body[field.key] = {
                ...(body[field.key] as object),
                [field.nested[np % field.nested.length]!]: nv,
              };
            } else body[field.key] = v;
          }
          const path = `/api${c.route.path.replace(/:\w+/g, c.param)}`;
          const query = Object.entries(c.query)
            .map(([k, v]) => `${encode(k)}=${encode(text(v))}`)
            .concat(c.rawQuery ? [c.rawQuery] : [])
            .join('&');
          const url = query ? `${path}?${query}` : path;
          const agent = agents.get(c.caller) ?? request(api.app);
          let req = agent[c.route.method](url);
          if (c.header && !(c.header[0] === 'authorization' && c.caller !== 'signed-out'))
            req = req.set(c.header[0], c.header[1]);
          const before = c.caller === 'signed-out' || c.route.method === 'get' ? null : await snapshot();
          let res;
          switch (c.bodyKind) {
            case 'json':
              res = await req.send(body);
              break;
            case 'raw-json':
              res = await req.set('content-type', 'application/json').send(c.raw);
              break;
            case 'text':
              res = await req.set('content-type', 'text/plain').send(c.raw);
              break;
            case 'form':
              res = await req
                .type('form')
                .send(Object.fromEntries(Object.entries(body).map(([k, v]) => [k, text(v)])));
              break;
            case 'multipart':
              res = await req.set('content-type', 'multipart/form-data; boundary=x').send(c.raw);
              break;
            default:
              res = await req;
          }
          const where = `${c.route.method.toUpperCase()} ${url.slice(0, 200)} as ${c.caller} (${c.bodyKind}${c.header ? `, ${c.header[0]}: ${c.header[1]}` : ''}): ${res.status}`;
          if (res.status >= 500) {
            failures.push(`${where} ${JSON.stringify(res.body).slice(0, 300)}`);
            return;
          }
          if (res.status === 400) {
            const parsed = errorBodySchema.safeParse(res.body);
            if (!parsed.success) failures.push(`${where} without the error body`);
            else if (
              parsed.data.error.code === 'validation' &&
              Object.keys(parsed.data.error.fields ?? {}).length === 0
            )
              failures.push(`${where} names no field: ${parsed.data.error.message}`);
          }
          if (before && res.status >= 400 && res.status !== 401) {
            const after = await snapshot();
            const changed = Object.keys(before).filter(
              (t) => before[t] !== after[t] && t !== 'sessions' && t !== 'lapse_watch_runs',
            );
            if (changed.length) failures.push(`${where} wrote to ${changed.join(', ')} while refusing`);
          }
        }),
        {
          numRuns: RUNS,
          ...(SEED !== undefined ? { seed: SEED } : {}),
          interruptAfterTimeLimit: Number(process.env.FUZZ_TIME_LIMIT_MS ?? 240_000),
        },
      );
      console.log(`fuzz cases: ${cases} over ${routes.length} routes; problems: ${failures.length}`);
      expect([...new Set(failures)].slice(0, 40)).toEqual([]);
    },
    Number(process.env.FUZZ_TIMEOUT_MS ?? 300_000),
  );
});
