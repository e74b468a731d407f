// Files in an S3-compatible object store, reached only through the AWS SDK: a local fake in development
// and tests, a hosted bucket in production.
import {
  DeleteObjectCommand,
  GetObjectCommand,
  HeadObjectCommand,
  PutObjectCommand,
  S3Client,
} from '@aws-sdk/client-s3';
import { Upload } from '@aws-sdk/lib-storage';
import type { Readable } from 'node:stream';
import type { Config } from '../config.js';

export interface StoredObject {
  body: Buffer;
  contentType: string | undefined;
}

/** An object being written from a stream: `done` settles when it is stored; `abort` leaves nothing. */
export interface StreamingPut {
  done: Promise<void>;
  abort(): Promise<void>;
}

/** Parts of a streamed object: S3's smallest part, so at most about this much is held per upload. */
export const STREAM_PART_BYTES = 5 * 1024 * 1024;

export interface Storage {
  put(key: string, body: Buffer | Uint8Array, contentType: string): Promise<void>;
  /**
   * Stores a stream of unknown length: one PUT when it ends within one part, else a multipart upload of
   * 5 MB parts, one at a time. Until `body` ends nothing is visible under `key`.
   */
  putStream(key: string, body: Readable, contentType: string): StreamingPut;
  get(key: string): Promise<StoredObject>;
  /** Whether an object exists under key. */
  exists(key: string): Promise<boolean>;
  delete(key: string): Promise<void>;
  close(): void;
}

export function createStorage(s3: Config['s3']): Storage {
  const client = new S3Client({
    endpoint: s3.endpoint,
    region: s3.region,
    forcePathStyle: s3.forcePathStyle,
    credentials: { accessKeyId: s3.accessKeyId, secretAccessKey: s3.secretAccessKey },
    // Without these the SDK frames uploads as aws-chunked with a trailing checksum, which the local
    // fake stores inside the object: silent corruption. Checksums only where the API requires them.
    requestChecksumCalculation: 'WHEN_REQUIRED',
    responseChecksumValidation: 'WHEN_REQUIRED',
  });
  const Bucket = s3.bucket;
  return {
    async put(key, body, contentType) {
      await client.send(
        new PutObjectCommand({
          Bucket,
          Key: key,
          Body: body,
          ContentType: contentType,
          ContentLength: body.byteLength,
        }),
      );
    },
    putStream(key, body, contentType) {
      const upload = new Upload({
        client,
        params: { Bucket, Key: key, Body: body, ContentType: contentType },
        queueSize: 1,
        partSize: STREAM_PART_BYTES,
        leavePartsOnError: false,
      });
      const done = upload.done().then(() => undefined);
      // The caller reads the outcome from `done`; an abort's rejection of it is expected.
      done.catch(() => undefined);
      return {
        done,
        async abort() {
          await upload.abort().catch(() => undefined);
          // A part or a PUT that raced the abort: the key is new and random, so deleting it is safe.
          await client.send(new DeleteObjectCommand({ Bucket, Key: key })).catch(() => undefined);
        },
      };
    },
    async get(key) {
      const out = await client.send(new GetObjectCommand({ Bucket, Key: key }));
      if (!out.Body) throw new Error(`Object ${key} has no body`);
      return { body: Buffer.from(await out.Body.transformToByteArray()), contentType: out.ContentType };
    },
    async exists(key) {
      try {
        await client.send(new HeadObjectCommand({ Bucket, Key: key }));
        return true;
      } catch (err) {
        const status = (err as { $metadata?: { httpStatusCode?: number } }).$metadata?.httpStatusCode;
        if (status === 404) return false;
        throw err;
      }
    },
    async delete(key) {
      await client.send(new DeleteObjectCommand({ Bucket, Key: key }));
    },
    close() {
      client.destroy();
    },
  };
}
