// Finding 8 (issue 11), imports: a spreadsheet streams to the object store as it arrives (never buffered
// whole in memory by the multipart parser), with the 20 MB cap enforced while the bytes flow; an
// over-cap, refused or broken-off file leaves no import row and no object.
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { errorOf, signIn, startTestApi, type TestApi } from '../../support/api-app.js';
import { makeWorld, TEST_PASSWORD } from '../../support/factories.js';
import { csv, upload } from '../../support/imports.js';
import { bucketKeys, watchStreamedUploads, type Taken } from '../../support/storage-watch.js';

const MB = 1024 * 1024;

/** A welders CSV of about `size` bytes: a header and as many plain rows as it takes. */
function bigCsv(size: number): Buffer {
  const head = 'Stamp,Name,Shop\r\n';
  const row = (i: number) => `W-${String(i).padStart(6, '0')},Welder number ${i} of a long crew list,AA\r\n`;
  const rows: string[] = [head];
  let length = head.length;
  for (let i = 0; length < size; i++) {
    const r = row(i);
    rows.push(r);
    length += r.length;
  }
  return Buffer.from(rows.join(''));
}

describe('import files stream to the object store', () => {
  let api: TestApi;
  let bucket: ReturnType<typeof bucketKeys>;
  let taken: Map<string, Taken>;
  beforeAll(async () => {
    api = await startTestApi();
    bucket = bucketKeys(api.config);
    taken = watchStreamedUploads(api.deps.storage);
  });
  afterAll(async () => {
    bucket.close();
    await api.close();
  });

  const objectsOf = (orgId: string) => bucket.under(`imports/${orgId}/`);
  const rowsOf = async (orgId: string) =>
    (await api.ds.query<{ n: number }[]>(`SELECT count(*)::int AS n FROM imports WHERE organization_id = $1`, [orgId]))[0]!
      .n;

  it('refuses a 21 MB file with 413 once 20 MB have streamed to the store, and keeps nothing', { timeout: 90_000 }, async () => {
    const world = await makeWorld(api.ds);
    const qa = await signIn(api.app, world.qa.email, TEST_PASSWORD);
    const res = await qa.post('/api/imports').field('kind', 'welders').attach('file', bigCsv(21 * MB), 'crew.csv');
    expect(res.status).toBe(413);
    expect(errorOf(res).message).toMatch(/larger than 20 MB/);
    // The bytes went to the store as they came (more than one 5 MB part) and the store's upload was aborted.
    const key = [...taken.keys()].find((k) => k.startsWith(`imports/${world.org.id}/`));
    expect(key).toBeDefined();
    expect(taken.get(key!)!.bytes).toBeGreaterThan(5 * MB);
    expect(taken.get(key!)!.settled).toBe(true);
    expect(await rowsOf(world.org.id)).toBe(0);
    expect(await objectsOf(world.org.id)).toEqual([]);
  });

  it('refuses what is not a spreadsheet before a byte is stored, and an unknown kind after it, keeping nothing', async () => {
    const world = await makeWorld(api.ds);
    const qa = await signIn(api.app, world.qa.email, TEST_PASSWORD);
    const pdf = await qa
      .post('/api/imports')
      .field('kind', 'welders')
      .attach('file', Buffer.from('%PDF-1.4\n1 0 obj\n<< >>\nendobj\n'), 'crew.csv');
    expect(pdf.status).toBe(400);
    expect(errorOf(pdf).fields?.file).toMatch(/PDF/);
    expect([...taken.keys()].some((k) => k.startsWith(`imports/${world.org.id}/`))).toBe(false);
    const kind = await qa
      .post('/api/imports')
      .attach('file', csv([['Stamp', 'Name'], ['W-1', 'Una Fell']]), 'crew.csv')
      .field('kind', 'no-such-kind');
    expect(kind.status).toBe(400);
    expect(await rowsOf(world.org.id)).toBe(0);
    expect(await objectsOf(world.org.id)).toEqual([]);
  });

  it('stores an accepted file whole and reads its columns from the store', async () => {
    const world = await makeWorld(api.ds);
    const qa = await signIn(api.app, world.qa.email, TEST_PASSWORD);
    const file = bigCsv(6 * MB);
    const up = await upload(qa, 'welders', file, 'crew.csv');
    expect(up.headers).toEqual(['Stamp', 'Name', 'Shop']);
    expect(up.sizeBytes).toBe(file.length);
    expect(await objectsOf(world.org.id)).toHaveLength(1);
    expect(taken.get((await objectsOf(world.org.id))[0]!)!.bytes).toBe(file.length);
  });
});
