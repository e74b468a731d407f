// Faults (issue 11): PostgreSQL stopped and started again under load, and the object store going away
// during an upload. The API answers 503 with a clear message while a part is away (never a 500, never a
// hang), comes back by itself when it returns (no restart, sessions still valid), and nothing is left
// half-written: every save either answered 201 and is there, or answered otherwise and is not.
import { execFile } from 'node:child_process';
import path from 'node:path';
import { promisify } from 'node:util';
import { ListObjectsV2Command, S3Client } from '@aws-sdk/client-s3';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { errorOf, signIn, startTestApi, testConfig, type TestApi } from '../../support/api-app.js';
import { startTcpProxy, type TcpProxy } from '../../support/api-tcp-proxy.js';
import { makeWorld, TEST_PASSWORD } from '../../support/factories.js';
import { samplePng } from '../../support/api-records.js';
import { waitForTaken, watchStreamedUploads, type Taken } from '../../support/storage-watch.js';
import { createDataSource, runMigrations } from '../../../apps/api/src/db/data-source.js';
import { repoRoot } from '../../../apps/api/src/config.js';

const run = promisify(execFile);
const sleep = (ms: number) => new Promise((r) => setTimeout(r, ms));

describe('PostgreSQL stopped and started again under load', () => {
  // A cluster of this test's own (the other test files keep theirs), stopped and started for real.
  const base = testConfig();
  const env = {
    ...process.env,
    DATA_DIR: path.join(process.env.DATA_DIR ?? path.join(repoRoot, '.data-test'), 'fault-pg'),
    PGPORT: String(Number(base.db.port) + 7),
    PGDATABASE: 'beadroll_fault',
  };
  const pg = (cmd: string) =>
    run(
      'bash',
      [path.join(repoRoot, 'docker-free-scripts/pg.sh'), cmd, ...(cmd === 'start' ? ['--fast'] : [])],
      { env },
    );
  let api: TestApi;

  beforeAll(async () => {
    await pg('start');
    const ds = createDataSource(
      { ...base.db, port: Number(env.PGPORT), database: env.PGDATABASE },
      { poolSize: 6 },
    );
    await ds.initialize();
    await runMigrations(ds);
    api = await startTestApi({ dataSource: ds });
  }, 120_000);
  afterAll(async () => {
    await api?.close();
    await pg('stop').catch(() => undefined);
  }, 60_000);

  it('answers 503 with a clear message while it is down, recovers by itself, and leaves no half-written save', async () => {
    const world = await makeWorld(api.ds);
    const qa = await signIn(api.app, world.qa.email, TEST_PASSWORD);
    const outcomes: {
      phase: string;
      status: number;
      code?: string;
      message?: string;
      ms: number;
      shop?: string;
    }[] = [];
    let phase = 'up';
    let stop = false;
    let n = 0;
    const worker = async (w: number) => {
      while (!stop) {
        const write = n % 2 === 0;
        const code = `F${w}-${n++}`;
        const started = Date.now();
        const startedIn = phase;
        const res = write
          ? await qa.post('/api/shops').send({ name: `Fault ${code}`, code })
          : await qa.get('/api/welders');
        const body = res.body as { error?: { code: string; message: string } };
        outcomes.push({
          phase: startedIn === phase ? phase : `${startedIn}→${phase}`,
          status: res.status,
          ms: Date.now() - started,
          ...(body.error ? { code: body.error.code, message: body.error.message } : {}),
          ...(write ? { shop: code } : {}),
        });
        if (res.status >= 500) await sleep(50);
      }
    };
    const load = Promise.all([1, 2, 3, 4].map(worker));
    await sleep(1500);
    phase = 'stopping';
    await pg('stop');
    phase = 'down';
    await sleep(2500);
    phase = 'starting';
    await pg('start');
    phase = 'back';
    const deadline = Date.now() + 20_000;
    while (Date.now() < deadline && outcomes.filter((o) => o.phase === 'back' && o.status < 300).length < 20)
      await sleep(100);
    stop = true;
    await load;

    const during = outcomes.filter((o) => o.phase === 'down');
    expect(outcomes.filter((o) => o.status >= 500 && o.status !== 503)).toEqual([]);
    expect(during.length).toBeGreaterThan(0);
    for (const o of during)
      expect(o).toMatchObject({
        status: 503,
        code: 'unavailable',
        message: 'The database is not reachable; try again shortly',
      });
    expect(Math.max(...during.map((o) => o.ms))).toBeLessThan(10_000);
    // Back without a restart, on the same session.
    expect(outcomes.filter((o) => o.phase === 'back' && o.status < 300).length).toBeGreaterThanOrEqual(20);
    await qa.get('/api/me').expect(200);
    // A save that answered 201 is there; one started while the database was down is not. (One in flight
    // at the moment it stopped may have committed before its answer was lost: then it is whole.)
    const saved = new Set(
      (
        await api.ds.query<{ code: string }[]>(`SELECT code FROM shops WHERE organization_id = $1`, [
          world.org.id,
        ])
      ).map((r) => r.code),
    );
    for (const o of outcomes.filter((x) => x.shop)) {
      if (o.status === 201) expect(saved.has(o.shop!), `${o.shop} answered 201`).toBe(true);
      if (o.phase === 'down') expect(saved.has(o.shop!), `${o.shop} started while down`).toBe(false);
    }
    // Whole or not at all: every saved shop has its audit row.
    const audited = await api.ds.query<{ n: number }[]>(
      `SELECT count(*)::int AS n FROM audit_events WHERE organization_id = $1 AND action = 'shop.created'`,
      [world.org.id],
    );
    expect(audited[0]!.n).toBe(saved.size - 2); // the world's own two shops were written directly
    console.log(
      `faults: ${outcomes.length} requests, ${during.length} while down (all 503), ${outcomes.filter((o) => o.phase === 'back' && o.status < 300).length} answered after the restart`,
    );
  }, 120_000);
});

describe('the object store going away during an upload', () => {
  let proxy: TcpProxy;
  let api: TestApi;
  let s3: S3Client;
  let taken: Map<string, Taken>;
  beforeAll(async () => {
    const c = testConfig().s3;
    const url = new URL(c.endpoint);
    proxy = await startTcpProxy({ host: url.hostname, port: Number(url.port) });
    api = await startTestApi({ config: { s3: { ...c, endpoint: `http://127.0.0.1:${proxy.port}` } } });
    taken = watchStreamedUploads(api.deps.storage);
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
    await proxy.cut();
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

  it('answers 503 when the store is away, before or halfway through a file; keeps no row and no object; works again when it is back', async () => {
    const world = await makeWorld(api.ds);
    const qa = await signIn(api.app, world.qa.email, TEST_PASSWORD);
    const ok = await qa
      .post('/api/uploads')
      .field('kind', 'other')
      .attach('file', samplePng(), 'before.png')
      .expect(201);
    const keptId = (ok.body as { id: string }).id;

    await proxy.cut();
    const away = await qa.post('/api/uploads').field('kind', 'other').attach('file', samplePng(), 'away.png');
    expect(away.status).toBe(503);
    expect(errorOf(away)).toMatchObject({
      code: 'unavailable',
      message: 'The file store is not answering; nothing was saved. Try again shortly.',
    });
    const download = await qa.get(`/api/uploads/${keptId}/content`);
    expect(download.status).toBe(503);
    expect(errorOf(download).message).toMatch(/file store is not answering/);
    await proxy.restore();

    // Halfway: a 12 MB PDF whose first part is already in the store when the store goes away.
    const big = Buffer.concat([
      Buffer.from('%PDF-1.4\n'),
      Buffer.alloc(12 * 1024 * 1024, 'plain text line\n'),
      Buffer.from('\n%%EOF\n'),
    ]);
    const pending = qa
      .post('/api/uploads')
      .field('kind', 'other')
      .attach('file', big, 'halfway.pdf')
      .then((r) => r);
    await waitForTaken(taken, `uploads/${world.org.id}/`, 5 * 1024 * 1024);
    await proxy.cut();
    const halfway = await pending;
    await proxy.restore();
    expect(halfway.status).toBe(503);
    expect(errorOf(halfway).code).toBe('unavailable');

    expect(await rowsOf(world.org.id)).toBe(1);
    expect((await objectsOf(world.org.id)).length).toBe(1);
    await qa.post('/api/uploads').field('kind', 'other').attach('file', samplePng(), 'after.png').expect(201);
    expect(await rowsOf(world.org.id)).toBe(2);
    expect((await objectsOf(world.org.id)).length).toBe(2);
  }, 120_000);
});
