// The development and test object store: an S3-compatible server (npm s3rver) on 127.0.0.1 keeping its
// objects under $DATA_DIR/s3/. The API reaches it only through @aws-sdk/client-s3, as it would a hosted
// bucket. Like a hosted bucket it answers only signed requests made with its one key pair (issue 11,
// finding 5): the pair named by S3_ACCESS_KEY_ID / S3_SECRET_ACCESS_KEY, else the data folder's own
// random pair (apps/api/src/dev-secrets.ts), which the API reads from the same folder.
import S3rver from 's3rver';
import { createHash, createHmac, timingSafeEqual } from 'node:crypto';
import { mkdir } from 'node:fs/promises';
import { SignatureV4 } from '@smithy/signature-v4';
import { createRequire } from 'node:module';
import path from 'node:path';
import { pathToFileURL } from 'node:url';
import { devSecrets } from '../apps/api/src/dev-secrets.js';

export interface ObjectStore {
  port: number;
  close(): Promise<void>;
}

export interface StoreCredentials {
  accessKeyId: string;
  secretAccessKey: string;
}

/** The key pair for the store of a data folder: the environment's, else the folder's own. */
export function storeCredentials(dataDir: string, env: NodeJS.ProcessEnv = process.env): StoreCredentials {
  if (env.S3_ACCESS_KEY_ID && env.S3_SECRET_ACCESS_KEY)
    return { accessKeyId: env.S3_ACCESS_KEY_ID, secretAccessKey: env.S3_SECRET_ACCESS_KEY };
  const s = devSecrets(dataDir);
  return { accessKeyId: s.s3AccessKeyId, secretAccessKey: s.s3SecretAccessKey };
}

interface S3rverAccount {
  createKeyPair(accessKeyId: string, secretAccessKey: string): void;
  revokeAccessKey(accessKeyId: string): void;
}
const { DUMMY_ACCOUNT } = createRequire(import.meta.url)('s3rver/lib/models/account.js') as {
  DUMMY_ACCOUNT: S3rverAccount;
};

const DENIED = `<?xml version="1.0" encoding="UTF-8"?>
<Error><Code>AccessDenied</Code><Message>Sign the request with the store's key pair</Message></Error>`;

export async function startObjectStore(opts: {
  port: number;
  dir: string;
  bucket: string;
  credentials: StoreCredentials;
}): Promise<ObjectStore> {
  await mkdir(opts.dir, { recursive: true });
  // s3rver knows one account; give it our key pair and take away its well-known one.
  DUMMY_ACCOUNT.revokeAccessKey('S3RVER');
  DUMMY_ACCOUNT.createKeyPair(opts.credentials.accessKeyId, opts.credentials.secretAccessKey);
  const server = new S3rver({
    port: opts.port,
    address: '127.0.0.1',
    directory: opts.dir,
    silent: true,
    configureBuckets: [{ name: opts.bucket, configs: [] }],
  });
  // s3rver serves unsigned (anonymous) requests and does not check version 4 signatures at all; a bucket
  // holding every company's files must do both. This runs before s3rver's own middleware: a request
  // goes on only when its Authorization header is a version 4 signature made with our key pair.
  const verify = sigV4Verifier(opts.credentials);
  const koa = server as unknown as { middleware: ((ctx: KoaContext, next: () => Promise<void>) => Promise<void>)[] };
  koa.middleware.unshift(async (ctx, next) => {
    if (!(await verify(ctx))) {
      ctx.status = 403;
      ctx.type = 'application/xml';
      ctx.body = DENIED;
      return;
    }
    await next();
  });
  await server.run();
  return { port: opts.port, close: () => server.close() };
}

interface KoaContext {
  method: string;
  path: string;
  querystring: string;
  headers: Record<string, string | string[] | undefined>;
  get(name: string): string;
  status: number;
  type: string;
  body: unknown;
}

/** node:crypto as the hash the signer wants (HMAC when given a key). */
class NodeSha256 {
  private readonly hash;
  constructor(secret?: string | ArrayBuffer | ArrayBufferView) {
    this.hash = secret === undefined ? createHash('sha256') : createHmac('sha256', bytes(secret));
  }
  update(data: string | ArrayBuffer | ArrayBufferView): void {
    this.hash.update(bytes(data));
  }
  digest(): Promise<Uint8Array> {
    return Promise.resolve(this.hash.digest());
  }
}

const bytes = (d: string | ArrayBuffer | ArrayBufferView): string | Uint8Array =>
  typeof d === 'string' ? d : d instanceof ArrayBuffer ? new Uint8Array(d) : new Uint8Array(d.buffer, d.byteOffset, d.byteLength);

const AUTH = /^AWS4-HMAC-SHA256 Credential=([^/]+)\/(\d{8})\/([^/]+)\/s3\/aws4_request, ?SignedHeaders=([a-z0-9;-]+), ?Signature=([0-9a-f]{64})$/;

/** Re-signs the request with the store's key pair (as the AWS SDK signed it) and compares signatures. */
function sigV4Verifier(credentials: StoreCredentials) {
  return async (ctx: KoaContext): Promise<boolean> => {
    const m = AUTH.exec(ctx.get('authorization'));
    const amzDate = ctx.get('x-amz-date');
    if (!m || m[1] !== credentials.accessKeyId || !/^\d{8}T\d{6}Z$/.test(amzDate)) return false;
    const [, , , region, signedHeaders, provided] = m as unknown as [string, string, string, string, string, string];
    const headers: Record<string, string> = {};
    for (const name of signedHeaders.split(';')) {
      const v = ctx.headers[name];
      if (v === undefined) return false;
      headers[name] = Array.isArray(v) ? v.join(',') : v;
    }
    const query: Record<string, string | string[]> = {};
    for (const [k, v] of new URLSearchParams(ctx.querystring)) {
      const had = query[k];
      query[k] = had === undefined ? v : Array.isArray(had) ? [...had, v] : [had, v];
    }
    const signer = new SignatureV4({ credentials, region, service: 's3', sha256: NodeSha256, uriEscapePath: false, applyChecksum: false });
    const date = new Date(`${amzDate.slice(0, 4)}-${amzDate.slice(4, 6)}-${amzDate.slice(6, 8)}T${amzDate.slice(9, 11)}:${amzDate.slice(11, 13)}:${amzDate.slice(13, 15)}Z`);
    const signed = await signer.sign(
      { method: ctx.method, protocol: 'http:', hostname: headers.host ?? '', path: ctx.path, query, headers },
      { signingDate: date, unsignableHeaders: new Set(), signableHeaders: new Set(Object.keys(headers)) },
    );
    const again = /Signature=([0-9a-f]{64})/.exec(String(signed.headers.authorization ?? ''))?.[1] ?? '';
    return again.length === provided.length && timingSafeEqual(Buffer.from(again), Buffer.from(provided));
  };
}

if (import.meta.url === pathToFileURL(process.argv[1] ?? '').href) {
  const port = Number(process.env.S3_PORT ?? 4569);
  const dataDir = process.env.DATA_DIR ?? '.data';
  const dir = path.join(dataDir, 's3');
  const bucket = process.env.S3_BUCKET ?? 'beadroll';
  const store = await startObjectStore({ port, dir, bucket, credentials: storeCredentials(dataDir) });
  console.log(`beadroll: object store on http://127.0.0.1:${port}, bucket ${bucket}, files in ${dir}`);
  const stop = () => void store.close().then(() => process.exit(0));
  process.on('SIGINT', stop);
  process.on('SIGTERM', stop);
}
