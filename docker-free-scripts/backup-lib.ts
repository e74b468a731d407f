// Shared parts of `npm run backup` and `npm run restore`: the configuration (the API's own loader, so the
// same PG* and S3_* settings and the data folder's own key pair apply), PostgreSQL's client programs, the
// object store client and checksums.
import { execFile } from 'node:child_process';
import { createHash } from 'node:crypto';
import { readdirSync } from 'node:fs';
import { readFile } from 'node:fs/promises';
import { promisify } from 'node:util';
import { S3Client } from '@aws-sdk/client-s3';
import { loadConfig, type Config } from '../apps/api/src/config.js';

export const BACKUP_FORMAT = 'beadroll-backup/1';

export interface Manifest {
  format: typeof BACKUP_FORMAT;
  createdAt: string;
  database: {
    file: string;
    sha256: string;
    size: number;
    name: string;
    migration: string | null;
    rows: Record<string, number>;
  };
  objects: {
    bucket: string;
    items: { key: string; file: string; size: number; sha256: string; contentType: string | null }[];
  };
}

export const run = promisify(execFile);

export function config(): Config {
  return loadConfig(process.env);
}

/** Debian's newest PostgreSQL client program of that name (pg_dump, pg_restore). */
export function pgProgram(name: string): string {
  const versions = readdirSync('/usr/lib/postgresql').sort((a, b) => Number(b) - Number(a));
  if (!versions[0]) throw new Error('PostgreSQL client programs not found under /usr/lib/postgresql');
  return `/usr/lib/postgresql/${versions[0]}/bin/${name}`;
}

export function pgArgs(c: Config): string[] {
  return ['-h', c.db.host, '-p', String(c.db.port), '-U', c.db.user, '-d', c.db.database];
}

export function pgEnv(c: Config): NodeJS.ProcessEnv {
  return { ...process.env, PGPASSWORD: c.db.password };
}

export function s3Client(c: Config): S3Client {
  return new S3Client({
    endpoint: c.s3.endpoint,
    region: c.s3.region,
    forcePathStyle: c.s3.forcePathStyle,
    credentials: { accessKeyId: c.s3.accessKeyId, secretAccessKey: c.s3.secretAccessKey },
    requestChecksumCalculation: 'WHEN_REQUIRED',
    responseChecksumValidation: 'WHEN_REQUIRED',
  });
}

export const sha256 = (bytes: Uint8Array) => createHash('sha256').update(bytes).digest('hex');
export const sha256File = async (file: string) => sha256(await readFile(file));

/** An object key as a file path inside the backup: every segment kept, none able to climb out. */
export function objectFile(key: string): string {
  const segments = key
    .split('/')
    .map((s) => (s === '' || s === '.' || s === '..' ? encodeURIComponent(s) || '%2F' : s));
  return ['objects', ...segments].join('/');
}
