// Streaming a file that arrives in a multipart request (multer's file stream) into the object store, for
// uploads and imports alike: the start of the file is read first so its type can be judged before a byte
// is stored, then the bytes go to the store as they arrive (one PUT, or 5 MB parts one at a time) while
// the size cap is enforced. On any failure — a refusal, an oversize or broken-off request, the store not
// answering — the store's upload is aborted, so nothing is left.
import { createHash } from 'node:crypto';
import { once } from 'node:events';
import { PassThrough, type Readable } from 'node:stream';
import type { Request } from 'express';
import type multer from 'multer';
import type { AppDeps } from './context.js';
import { AppError } from './errors.js';

export interface FileHead {
  head: Buffer;
  /** The rest of the file, chunk by chunk; null when the head is the whole file. */
  rest: AsyncIterator<Buffer> | null;
  /** True once the parser has cut the file at its size cap ('limit' from busboy). */
  truncated: () => boolean;
}

/** Reads at least `bytes` from the start of the stream (fewer when the file is shorter). */
export async function readHead(stream: Readable, bytes: number): Promise<FileHead> {
  let truncated = false;
  stream.once('limit', () => {
    truncated = true;
  });
  const chunks = stream[Symbol.asyncIterator]() as AsyncIterator<Buffer>;
  const parts: Buffer[] = [];
  let length = 0;
  while (length < bytes) {
    const next = await chunks.next();
    if (next.done) return { head: Buffer.concat(parts), rest: null, truncated: () => truncated };
    parts.push(next.value);
    length += next.value.length;
  }
  return { head: Buffer.concat(parts), rest: chunks, truncated: () => truncated };
}

export interface StreamToStore {
  stream: Readable;
  file: FileHead;
  key: string;
  contentType: string;
  maxBytes: number;
  tooLarge: () => AppError;
  /** Looks at each chunk on its way (may refuse by throwing an AppError); returns the bytes to keep. */
  filter?: (chunk: Buffer) => Promise<Buffer> | Buffer;
  /** The last check once every byte has passed, before the object is completed. */
  beforeEnd?: () => Promise<void>;
}

export const storeDown = () =>
  new AppError('unavailable', 'The file store is not answering; nothing was saved. Try again shortly.');

const incomplete = () =>
  AppError.validation({ file: 'The upload arrived incomplete or malformed; send it again' }, 'The upload is not valid');

/** Stores the file under `key`; resolves with its size and SHA-256 once the object is whole. */
export async function streamToStore(
  deps: Pick<AppDeps, 'storage' | 'logger'>,
  o: StreamToStore,
): Promise<{ size: number; sha256: string }> {
  const body = new PassThrough();
  const put = deps.storage.putStream(o.key, body, o.contentType);
  const failure = put.done.then(
    () => null,
    (err: unknown) => err ?? new Error('object store failed'),
  );
  const hash = createHash('sha256');
  let size = 0;
  const forward = async (chunk: Buffer) => {
    const kept = o.filter ? await o.filter(chunk) : chunk;
    if (kept.length === 0) return;
    hash.update(kept);
    size += kept.length;
    if (!body.write(kept)) await Promise.race([once(body, 'drain'), failure]);
  };
  try {
    await forward(o.file.head);
    if (o.file.rest)
      for (let next = await o.file.rest.next(); !next.done; next = await o.file.rest.next()) {
        if (o.file.truncated()) break;
        await forward(next.value);
      }
    if (o.file.truncated() || size > o.maxBytes) throw o.tooLarge();
    await o.beforeEnd?.();
    body.end();
    const storeError = await failure;
    if (storeError) {
      deps.logger.error({ err: storeError, key: o.key }, 'could not store a file');
      throw storeDown();
    }
  } catch (err) {
    o.stream.resume();
    body.destroy();
    await put.abort();
    if (err instanceof AppError) throw err;
    const storeError = await Promise.race([failure, Promise.resolve(null)]);
    if (storeError) throw storeDown();
    // The request ended before the file did (the client went away, or the multipart body broke off).
    throw incomplete();
  }
  return { size, sha256: hash.digest('hex') };
}

/**
 * A multer storage engine that hands each arriving file to `store` (which streams it with
 * `streamToStore`) and, should multer give up on the request afterwards, deletes what was stored.
 */
export function streamingEngine<T extends object>(
  deps: Pick<AppDeps, 'storage'>,
  store: (req: Request, file: { stream: Readable; originalname: string }) => Promise<T>,
  keyOf: (stored: Partial<T>) => string | undefined,
): multer.StorageEngine {
  return {
    _handleFile(req, file, cb) {
      store(req, file).then(
        (stored) => cb(null, stored),
        (err: unknown) => cb(err),
      );
    },
    _removeFile(_req, file, cb) {
      const key = keyOf(file as unknown as Partial<T>);
      if (!key) return cb(null);
      deps.storage.delete(key).then(
        () => cb(null),
        (err: unknown) => cb(err as Error),
      );
    },
  };
}
