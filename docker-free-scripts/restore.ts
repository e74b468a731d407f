// npm run restore -- <folder>: a backup made by `npm run backup` into an EMPTY database and bucket (the
// ones PG* and S3_* name; with a new DATA_DIR, `npm run services -- up` first). Every checksum is checked
// before anything is written; a database that already has tables, or a bucket that already has objects,
// is refused. Afterwards the row counts and files are compared with the manifest.
import { readFile } from 'node:fs/promises';
import path from 'node:path';
import { CreateBucketCommand, ListObjectsV2Command, PutObjectCommand } from '@aws-sdk/client-s3';
import pg from 'pg';
import {
  BACKUP_FORMAT,
  config,
  pgArgs,
  pgEnv,
  pgProgram,
  run,
  s3Client,
  sha256,
  sha256File,
  type Manifest,
} from './backup-lib.js';

const fail = (message: string): never => {
  console.error(`beadroll: restore refused: ${message}`);
  process.exit(1);
};

const folder = process.argv[2]
  ? path.resolve(process.argv[2])
  : fail('name the backup folder: npm run restore -- <folder>');
const manifest = JSON.parse(await readFile(path.join(folder, 'manifest.json'), 'utf8')) as Manifest;
if (manifest.format !== BACKUP_FORMAT)
  fail(`${folder} is not a Beadroll backup (${String(manifest.format)})`);
if ((await sha256File(path.join(folder, manifest.database.file))) !== manifest.database.sha256)
  fail('the database dump does not match its checksum');
const files = new Map<string, Buffer>();
for (const item of manifest.objects.items) {
  const bytes = await readFile(path.join(folder, item.file));
  if (sha256(bytes) !== item.sha256) fail(`${item.file} does not match its checksum`);
  files.set(item.key, bytes);
}

const c = config();
const client = new pg.Client({ ...c.db });
await client.connect();
const existing = Number(
  (
    await client.query<{ n: string }>(
      `SELECT count(*) AS n FROM information_schema.tables WHERE table_schema = 'public'`,
    )
  ).rows[0]!.n,
);
if (existing > 0) fail(`database ${c.db.database} already has ${existing} tables; restore into an empty one`);

const s3 = s3Client(c);
try {
  await s3.send(new CreateBucketCommand({ Bucket: c.s3.bucket }));
} catch (err) {
  const name = (err as { name?: string }).name;
  if (name !== 'BucketAlreadyOwnedByYou' && name !== 'BucketAlreadyExists') throw err;
}
const present = await s3.send(new ListObjectsV2Command({ Bucket: c.s3.bucket, MaxKeys: 1 }));
if ((present.Contents ?? []).length > 0)
  fail(`bucket ${c.s3.bucket} is not empty; restore into an empty one`);

await run(
  pgProgram('pg_restore'),
  [...pgArgs(c), '--no-owner', '--exit-on-error', path.join(folder, manifest.database.file)],
  { env: pgEnv(c) },
);
for (const item of manifest.objects.items)
  await s3.send(
    new PutObjectCommand({
      Bucket: c.s3.bucket,
      Key: item.key,
      Body: files.get(item.key)!,
      ContentType: item.contentType ?? undefined,
      ContentLength: item.size,
    }),
  );

// The restored copy, counted again.
const differ: string[] = [];
for (const [table, n] of Object.entries(manifest.database.rows)) {
  const now = Number((await client.query<{ n: string }>(`SELECT count(*) AS n FROM "${table}"`)).rows[0]!.n);
  if (now !== n) differ.push(`${table}: ${now} rows, the backup had ${n}`);
}
await client.end();
let stored = 0;
let token: string | undefined;
do {
  const page = await s3.send(new ListObjectsV2Command({ Bucket: c.s3.bucket, ContinuationToken: token }));
  stored += (page.Contents ?? []).length;
  token = page.IsTruncated ? page.NextContinuationToken : undefined;
} while (token);
s3.destroy();
if (stored !== manifest.objects.items.length)
  differ.push(`${stored} files stored, the backup had ${manifest.objects.items.length}`);
if (differ.length) fail(`the restored copy differs:\n  ${differ.join('\n  ')}`);
console.log(
  `beadroll: restored ${folder} into database ${c.db.database} and bucket ${c.s3.bucket}: ${Object.keys(manifest.database.rows).length} tables, ${manifest.objects.items.length} files, counts checked`,
);
