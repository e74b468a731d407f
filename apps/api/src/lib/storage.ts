// Files in an S3-compatible object store, reached only through the AWS SDK: a local fake in development
// and tests, a hosted bucket in production.
import {
  DeleteObjectCommand,
  GetObjectCommand,
  HeadObjectCommand,
  PutObjectCommand,
  S3Client,
} from '@aws-sdk/client-s3';
import type { Config } from '../config.js';

export interface StoredObject {
  body: Buffer;
  contentType: string | undefined;
}

export interface Storage {
  put(key: string, body: Buffer | Uint8Array, contentType: string): Promise<void>;
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
