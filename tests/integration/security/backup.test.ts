// Backup and restore (issue 11): `npm run backup` writes the database (pg_dump) and every file of the
// bucket with a manifest of checksums; `npm run restore` puts them into an empty database and bucket.
// The round trip is compared table by table (every row) and file by file (every byte). A restore over
// data, or from a backup whose bytes changed, is refused before anything is written.
import { randomBytes } from 'node:crypto';
import { execFile } from 'node:child_process';
import { mkdtemp, readFile, rm, writeFile } from 'node:fs/promises';
import os from 'node:os';
import path from 'node:path';
import { promisify } from 'node:util';
import { CreateBucketCommand, GetObjectCommand, ListObjectsV2Command, S3Client } from '@aws-sdk/client-s3';
import pg from 'pg';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { signIn, startTestApi, testConfig, type TestApi } from '../../support/api-app.js';
import { makeWorld, TEST_PASSWORD } from '../../support/factories.js';
import { couponBody, makeProcedure, samplePdf, samplePng } from '../../support/api-records.js';
import { createDataSource, runMigrations } from '../../../apps/api/src/db/data-source.js';
import { repoRoot } from '../../../apps/api/src/config.js';

const run = promisify(execFile);
const script = (name: string, arg: string, env: Record<string, string>) =>
  run(process.execPath, ['--import', 'tsx', path.join(repoRoot, 'docker-free-scripts', `${name}.ts`), arg], {
    cwd: repoRoot,
    env: { ...process.env, ...env },
  });

describe('npm run backup and npm run restore', () => {
  const base = testConfig();
  const id = randomBytes(4).toString('hex');
  const src = { PGDATABASE: `beadroll_bk_src_${id}`, S3_BUCKET: `backup-src-${id}` };
  const dst = { PGDATABASE: `beadroll_bk_dst_${id}`, S3_BUCKET: `backup-dst-${id}` };
  let admin: pg.Client;
  let api: TestApi;
  let s3: S3Client;
  let folder: string;

  beforeAll(async () => {
    admin = new pg.Client({ ...base.db });
    await admin.connect();
    await admin.query(`CREATE DATABASE ${src.PGDATABASE}`);
    await admin.query(`CREATE DATABASE ${dst.PGDATABASE}`);
    s3 = new S3Client({
      endpoint: base.s3.endpoint,
      region: base.s3.region,
      forcePathStyle: base.s3.forcePathStyle,
      credentials: { accessKeyId: base.s3.accessKeyId, secretAccessKey: base.s3.secretAccessKey },
    });
    await s3.send(new CreateBucketCommand({ Bucket: src.S3_BUCKET }));
    const ds = createDataSource({ ...base.db, database: src.PGDATABASE }, { poolSize: 3 });
    await ds.initialize();
    await runMigrations(ds);
    api = await startTestApi({ dataSource: ds, config: { s3: { ...base.s3, bucket: src.S3_BUCKET } } });
    folder = await mkdtemp(path.join(os.tmpdir(), 'beadroll-backup-'));
  }, 120_000);
  afterAll(async () => {
    await api?.close();
    for (const db of [src.PGDATABASE, dst.PGDATABASE])
      await admin.query(`DROP DATABASE IF EXISTS ${db} WITH (FORCE)`);
    await admin.end();
    s3.destroy();
    if (folder) await rm(folder, { recursive: true, force: true });
  }, 60_000);

  /** Every table's rows, as one digest per table. */
  async function tableDigests(database: string) {
    const client = new pg.Client({ ...base.db, database });
    await client.connect();
    try {
      const tables = (
        await client.query<{ name: string }>(
          `SELECT table_name AS name FROM information_schema.tables WHERE table_schema = 'public' AND table_type = 'BASE TABLE' ORDER BY 1`,
        )
      ).rows.map((r) => r.name);
      const out: Record<string, string> = {};
      for (const t of tables)
        out[t] = (
          await client.query<{ d: string }>(
            `SELECT count(*) || ':' || coalesce(md5(string_agg(x::text, '|' ORDER BY x::text)), '') AS d FROM "${t}" x`,
          )
        ).rows[0]!.d;
      return out;
    } finally {
      await client.end();
    }
  }

  async function files(bucket: string) {
    const out: Record<string, string> = {};
    const list = await s3.send(new ListObjectsV2Command({ Bucket: bucket }));
    for (const o of list.Contents ?? []) {
      const got = await s3.send(new GetObjectCommand({ Bucket: bucket, Key: o.Key! }));
      out[o.Key!] = Buffer.from(await got.Body!.transformToByteArray()).toString('base64');
    }
    return out;
  }

  it('round-trips every table and every file, and refuses a restore over data or from a changed backup', async () => {
    const world = await makeWorld(api.ds);
    const qa = await signIn(api.app, world.qa.email, TEST_PASSWORD);
    const proc = await makeProcedure(api.ds, world.org, { number: 'WPS-BACKUP' });
    await qa
      .post('/api/uploads')
      .field('kind', 'specimen-photo')
      .attach('file', samplePng(), 'root bend.png')
      .expect(201);
    await qa
      .post('/api/uploads')
      .field('kind', 'examination-report')
      .attach('file', await samplePdf(), 'lab report.pdf')
      .expect(201);
    const coupon = await qa
      .post('/api/coupons')
      .send(couponBody({ welderId: world.weldersA[0]!.id, shopId: world.shopA.id, procedureId: proc.id }))
      .expect(201);
    await qa
      .post(`/api/coupons/${(coupon.body as { id: string }).id}/certify`)
      .send({ certifiedOn: new Date().toISOString().slice(0, 10), version: 1 })
      .expect(201);

    const backup = await script('backup', folder, src);
    expect(backup.stdout).toMatch(/backup in .*2 files/);
    const restore = await script('restore', folder, dst);
    expect(restore.stdout).toMatch(/restored .* counts checked/);

    const [before, after] = [await tableDigests(src.PGDATABASE), await tableDigests(dst.PGDATABASE)];
    expect(Object.keys(after)).toEqual(Object.keys(before));
    expect(after).toEqual(before);
    expect(before.audit_events).not.toMatch(/^0:/);
    const [srcFiles, dstFiles] = [await files(src.S3_BUCKET), await files(dst.S3_BUCKET)];
    expect(Object.keys(srcFiles)).toHaveLength(2);
    expect(dstFiles).toEqual(srcFiles);

    // Over data: refused, nothing changed.
    const again = await script('restore', folder, dst).then(
      () => null,
      (err: { code: number; stderr: string }) => err,
    );
    expect(again?.code).toBe(1);
    expect(again?.stderr).toMatch(/already has \d+ tables; restore into an empty one/);
    expect(await tableDigests(dst.PGDATABASE)).toEqual(before);

    // A file of the backup changed: refused before anything is written.
    const manifest = JSON.parse(await readFile(path.join(folder, 'manifest.json'), 'utf8')) as {
      objects: { items: { file: string }[] };
    };
    const victim = path.join(folder, manifest.objects.items[0]!.file);
    const bytes = await readFile(victim);
    bytes[bytes.length - 1] = bytes[bytes.length - 1]! ^ 1;
    await writeFile(victim, bytes);
    const tampered = await script('restore', folder, {
      PGDATABASE: `beadroll_bk_none_${id}`,
      S3_BUCKET: `backup-none-${id}`,
    }).then(
      () => null,
      (err: { code: number; stderr: string }) => err,
    );
    expect(tampered?.code).toBe(1);
    expect(tampered?.stderr).toMatch(/does not match its checksum/);
  }, 180_000);
});
