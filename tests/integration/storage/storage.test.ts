import { randomBytes, randomUUID } from 'node:crypto';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { createStorage, type Storage } from '../../../apps/api/src/lib/storage.js';
import { testConfig } from '../../support/api-app.js';

describe('object storage through the S3 SDK', () => {
  let storage: Storage;
  beforeAll(() => {
    storage = createStorage(testConfig().s3);
  });
  afterAll(() => storage.close());

  it('stores and returns a binary file byte for byte, then deletes it', async () => {
    const key = `tests/${randomUUID()}/specimen photo.jpg`;
    // Random bytes, larger than one upload chunk, with every byte value present.
    const body = Buffer.concat([
      Buffer.from(Array.from({ length: 256 }, (_, i) => i)),
      randomBytes(300 * 1024),
    ]);
    await storage.put(key, body, 'image/jpeg');
    expect(await storage.exists(key)).toBe(true);
    const back = await storage.get(key);
    expect(back.contentType).toBe('image/jpeg');
    expect(back.body.length).toBe(body.length);
    expect(back.body.equals(body)).toBe(true);
    await storage.delete(key);
    expect(await storage.exists(key)).toBe(false);
  });

  it('keeps an empty file and a UTF-8 text file exact', async () => {
    const empty = `tests/${randomUUID()}/empty.txt`;
    const text = `tests/${randomUUID()}/notes.txt`;
    const content = Buffer.from('Root bend: no open discontinuity over 3 mm — Prüfung ✓\n', 'utf8');
    await storage.put(empty, Buffer.alloc(0), 'text/plain');
    await storage.put(text, content, 'text/plain; charset=utf-8');
    expect((await storage.get(empty)).body.length).toBe(0);
    expect((await storage.get(text)).body.equals(content)).toBe(true);
    await storage.delete(empty);
    await storage.delete(text);
  });
});
