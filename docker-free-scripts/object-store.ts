// The development and test object store: an S3-compatible server (npm s3rver) on 127.0.0.1 keeping its
// objects under $DATA_DIR/s3/. The API reaches it only through @aws-sdk/client-s3, as it would a hosted
// bucket.
import S3rver from 's3rver';
import { mkdir } from 'node:fs/promises';
import path from 'node:path';
import { pathToFileURL } from 'node:url';

export interface ObjectStore {
  port: number;
  close(): Promise<void>;
}

export async function startObjectStore(opts: { port: number; dir: string; bucket: string }): Promise<ObjectStore> {
  await mkdir(opts.dir, { recursive: true });
  const server = new S3rver({
    port: opts.port,
    address: '127.0.0.1',
    directory: opts.dir,
    silent: true,
    configureBuckets: [{ name: opts.bucket, configs: [] }],
  });
  await server.run();
  return { port: opts.port, close: () => server.close() };
}

if (import.meta.url === pathToFileURL(process.argv[1] ?? '').href) {
  const port = Number(process.env.S3_PORT ?? 4569);
  const dir = path.join(process.env.DATA_DIR ?? '.data', 's3');
  const bucket = process.env.S3_BUCKET ?? 'beadroll';
  const store = await startObjectStore({ port, dir, bucket });
  console.log(`beadroll: object store on http://127.0.0.1:${port}, bucket ${bucket}, files in ${dir}`);
  const stop = () => void store.close().then(() => process.exit(0));
  process.on('SIGINT', stop);
  process.on('SIGTERM', stop);
}
