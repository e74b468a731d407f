// Watches the bytes the object store takes from each streamed upload, by key (the app and the test
// share the Storage object of startTestApi), so a test can act while a file is still on its way.
import { Transform } from 'node:stream';
import { ListObjectsV2Command, S3Client } from '@aws-sdk/client-s3';
import type { Config } from '../../apps/api/src/config.js';
import type { Storage } from '../../apps/api/src/lib/storage.js';

export interface Taken {
  bytes: number;
  settled: boolean;
}

export function watchStreamedUploads(storage: Storage): Map<string, Taken> {
  const taken = new Map<string, Taken>();
  const putStream = storage.putStream.bind(storage);
  storage.putStream = (key, body, contentType) => {
    const seen: Taken = { bytes: 0, settled: false };
    taken.set(key, seen);
    const counter = new Transform({
      transform(chunk: Buffer, _enc, cb) {
        seen.bytes += chunk.length;
        cb(null, chunk);
      },
    });
    body.on('error', (err) => counter.destroy(err));
    body.on('close', () => {
      if (!body.readableEnded) counter.destroy();
    });
    const put = putStream(key, body.pipe(counter), contentType);
    put.done.then(
      () => (seen.settled = true),
      () => (seen.settled = true),
    );
    return put;
  };
  return taken;
}

/** Waits until some upload whose key starts with `prefix` has given the store more than `bytes`. */
export async function waitForTaken(
  taken: Map<string, Taken>,
  prefix: string,
  bytes: number,
  timeoutMs = 30_000,
) {
  const deadline = Date.now() + timeoutMs;
  for (;;) {
    const hit = [...taken.entries()].find(([k, t]) => k.startsWith(prefix) && t.bytes > bytes);
    if (hit) return hit[0];
    if (Date.now() > deadline) throw new Error(`no upload under ${prefix} passed ${bytes} bytes`);
    await new Promise((r) => setTimeout(r, 20));
  }
}

/** Lists the keys in the test API's bucket under a prefix (what a refused file may have left). */
export function bucketKeys(config: Config): { under(prefix: string): Promise<string[]>; close(): void } {
  const c = config.s3;
  const s3 = new S3Client({
    endpoint: c.endpoint,
    region: c.region,
    forcePathStyle: c.forcePathStyle,
    credentials: { accessKeyId: c.accessKeyId, secretAccessKey: c.secretAccessKey },
  });
  return {
    async under(prefix) {
      const out = await s3.send(new ListObjectsV2Command({ Bucket: c.bucket, Prefix: prefix }));
      return (out.Contents ?? []).flatMap((o) => (o.Key ? [o.Key] : []));
    },
    close: () => s3.destroy(),
  };
}
