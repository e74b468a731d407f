// npm run backup [-- <folder>]: the database (pg_dump, custom format) and every object of the store's
// bucket, with a manifest of checksums and row counts, into a new folder (default
// $DATA_DIR/backups/<UTC time>). Works the same against a hosted PostgreSQL and bucket (PG*, S3_*).
import { mkdir, writeFile, stat } from 'node:fs/promises';
import path from 'node:path';
import { GetObjectCommand, ListObjectsV2Command } from '@aws-sdk/client-s3';
import pg from 'pg';
import {
  BACKUP_FORMAT,
  config,
  objectFile,
  pgArgs,
  pgEnv,
  pgProgram,
  run,
  s3Client,
  sha256,
  sha256File,
  type Manifest,
} from './backup-lib.js';

const c = config();
const stamp = new Date().toISOString().replace(/[:.]/g, '-');
const out = path.resolve(process.argv[2] ?? path.join(c.dataDir, 'backups', stamp));
await mkdir(path.join(out, 'objects'), { recursive: true });

// The database, in one consistent snapshot.
const dumpFile = path.join(out, 'db.dump');
await run(pgProgram('pg_dump'), [...pgArgs(c), '--format=custom', '--no-owner', '--file', dumpFile], {
  env: pgEnv(c),
});
const client = new pg.Client({ ...c.db });
await client.connect();
const tables = (
  await client.query<{ name: string }>(
    `SELECT table_name AS name FROM information_schema.tables WHERE table_schema = 'public' AND table_type = 'BASE TABLE' ORDER BY 1`,
  )
).rows.map((r) => r.name);
const rows: Record<string, number> = {};
for (const t of tables)
  rows[t] = Number((await client.query<{ n: string }>(`SELECT count(*) AS n FROM "${t}"`)).rows[0]!.n);
const migration = tables.includes('typeorm_migrations')
  ? ((
      await client.query<{ name: string }>(
        `SELECT name FROM typeorm_migrations ORDER BY timestamp DESC LIMIT 1`,
      )
    ).rows[0]?.name ?? null)
  : null;
await client.end();

// Every object of the bucket, byte for byte.
const s3 = s3Client(c);
const items: Manifest['objects']['items'] = [];
let token: string | undefined;
do {
  const page = await s3.send(new ListObjectsV2Command({ Bucket: c.s3.bucket, ContinuationToken: token }));
  for (const o of page.Contents ?? []) {
    const got = await s3.send(new GetObjectCommand({ Bucket: c.s3.bucket, Key: o.Key! }));
    const bytes = await got.Body!.transformToByteArray();
    const file = objectFile(o.Key!);
    await mkdir(path.dirname(path.join(out, file)), { recursive: true });
    await writeFile(path.join(out, file), bytes);
    items.push({
      key: o.Key!,
      file,
      size: bytes.byteLength,
      sha256: sha256(bytes),
      contentType: got.ContentType ?? null,
    });
  }
  token = page.IsTruncated ? page.NextContinuationToken : undefined;
} while (token);
s3.destroy();

const manifest: Manifest = {
  format: BACKUP_FORMAT,
  createdAt: new Date().toISOString(),
  database: {
    file: 'db.dump',
    sha256: await sha256File(dumpFile),
    size: (await stat(dumpFile)).size,
    name: c.db.database,
    migration,
    rows,
  },
  objects: { bucket: c.s3.bucket, items },
};
await writeFile(path.join(out, 'manifest.json'), `${JSON.stringify(manifest, null, 2)}\n`);
console.log(
  `beadroll: backup in ${out}: database ${c.db.database} (${tables.length} tables, ${Object.values(rows).reduce((a, b) => a + b, 0)} rows), ${items.length} files`,
);
