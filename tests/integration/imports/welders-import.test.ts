import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { errorOf, signIn, startTestApi, type TestApi } from '../../support/api-app.js';
import { makeWorld, TEST_PASSWORD } from '../../support/factories.js';
import { check, commit, csv, upload } from '../../support/imports.js';

describe('importing welders', () => {
  let api: TestApi;
  beforeAll(async () => {
    api = await startTestApi();
  });
  afterAll(() => api.close());

  it('reports each bad row and column in the dry run, writes nothing, then commits the fixed file as one audited import; re-importing it changes nothing', async () => {
    const world = await makeWorld(api.ds);
    const qa = await signIn(api.app, world.qa.email, TEST_PASSWORD);
    const bad = csv([
      ['Welder No', 'Full name', 'Bay', 'Mail'],
      ['W-501', 'Nia Brode', 'AA', 'nia@example.com'],
      ['W-502', '', 'AA', ''],
      ['W 503', 'Oz Penhale', 'ZZ', 'not-an-address'],
      ['W-501', 'Nia Brode again', 'BB', ''],
      ['A-02', 'Bo Ferrand', 'AA', ''],
      ['A-01', 'Ada Quenby-Hart', 'BB', ''],
    ]);
    const up = await upload(qa, 'welders', bad, 'crew list.csv');
    expect(up.headers).toEqual(['Welder No', 'Full name', 'Bay', 'Mail']);
    // Obvious names are matched; "Welder No" and "Bay" are the company's own words: mapped by hand.
    expect(up.mapping).toMatchObject({ name: 'Full name', email: 'Mail', stamp: null, homeShop: null });
    const mapping = { stamp: 'Welder No', name: 'Full name', homeShop: 'Bay', email: 'Mail' };
    const checked = await check(qa, up.id, mapping);
    const r = checked.report!;
    expect(r.issues).toEqual([
      { row: 3, column: 'Full name', message: 'Required' },
      { row: 4, column: 'Bay', message: expect.stringMatching(/No shop “ZZ”/) as string },
      { row: 4, column: 'Welder No', message: '1 to 12 letters, digits or dashes' },
      { row: 4, column: 'Mail', message: 'Enter a valid e-mail address' },
      { row: 5, column: 'Welder No', message: 'Stamp W-501 is already on row 2 of this file' },
    ]);
    expect(r).toMatchObject({ rows: 6, errors: 3, new: 1, unchanged: 1, changed: 1 });
    expect(r.changes[0]).toMatchObject({ key: 'A-01', before: { name: 'Ada Quenby', homeShop: 'AA' }, after: { name: 'Ada Quenby-Hart', homeShop: 'BB' } });
    const refused = await qa.post(`/api/imports/${up.id}/commit`);
    expect(refused.status).toBe(400);
    expect(errorOf(refused).message).toMatch(/problems/);
    const [{ n }] = await api.ds.query<[{ n: number }]>(`SELECT count(*)::int AS n FROM welders WHERE organization_id = $1`, [world.org.id]);
    expect(n).toBe(5);

    const good = csv([
      ['Welder No', 'Full name', 'Bay', 'Mail'],
      ['W-501', 'Nia Brode', 'AA', 'nia@example.com'],
      ['W-502', 'Rui Santal', 'Beta Yard', ''],
      ['A-02', 'Bo Ferrand', 'AA', ''],
      ['A-01', 'Ada Quenby-Hart', 'BB', ''],
    ]);
    const up2 = await upload(qa, 'welders', good, 'crew list.csv');
    // The company's mapping was saved with the first check.
    expect(up2.mapping).toEqual(mapping);
    expect(up2.dateFormat).toBe('iso');
    const checked2 = await check(qa, up2.id, mapping);
    expect(checked2.report).toMatchObject({ errors: 0, new: 2, unchanged: 1, changed: 1 });
    const { view } = await commit(qa, up2.id);
    expect(view.status).toBe('committed');
    const rows = await api.ds.query<{ stamp: string; name: string; code: string; email: string }[]>(
      `SELECT w.stamp, w.name, s.code, w.email FROM welders w JOIN shops s ON s.id = w.home_shop_id
        WHERE w.organization_id = $1 AND w.stamp IN ('W-501', 'W-502', 'A-01') ORDER BY w.stamp`,
      [world.org.id],
    );
    expect(rows).toEqual([
      { stamp: 'A-01', name: 'Ada Quenby-Hart', code: 'BB', email: world.weldersA[0]!.email },
      { stamp: 'W-501', name: 'Nia Brode', code: 'AA', email: 'nia@example.com' },
      { stamp: 'W-502', name: 'Rui Santal', code: 'BB', email: '' },
    ]);
    const audit = await api.ds.query<{ action: string; after: Record<string, unknown> }[]>(
      `SELECT action, after FROM audit_events WHERE organization_id = $1 AND entity_type = 'import'`,
      [world.org.id],
    );
    expect(audit).toHaveLength(1);
    expect(audit[0]).toMatchObject({ action: 'import.committed', after: { new: 2, changed: 1, unchanged: 1, fileName: 'crew list.csv' } });
    // The file is kept in the object store, byte for byte.
    const stored = await api.deps.storage.get(audit[0]!.after.objectKey as string);
    expect(stored.body.equals(good)).toBe(true);

    const again = await upload(qa, 'welders', good, 'crew list.csv');
    const checked3 = await check(qa, again.id, mapping);
    expect(checked3.report).toMatchObject({ errors: 0, new: 0, changed: 0, unchanged: 4 });
  });

  it('refuses what is not a spreadsheet, by its content', async () => {
    const world = await makeWorld(api.ds);
    const qa = await signIn(api.app, world.qa.email, TEST_PASSWORD);
    const pdf = await qa.post('/api/imports').field('kind', 'welders').attach('file', Buffer.from('%PDF-1.7\n%âãÏÓ\n'), 'welders.csv');
    expect(pdf.status).toBe(400);
    expect(errorOf(pdf).fields?.file).toMatch(/PDF/);
    const binary = await qa.post('/api/imports').field('kind', 'welders').attach('file', Buffer.from([0x00, 0x01, 0x02, 0x41]), 'x.csv');
    expect(binary.status).toBe(400);
    const xls = await qa.post('/api/imports').field('kind', 'welders').attach('file', Buffer.from([0xd0, 0xcf, 0x11, 0xe0, 0xa1, 0xb1]), 'old.xls');
    expect(errorOf(xls).fields?.file).toMatch(/\.xlsx or \.csv/);
    const zip = await qa.post('/api/imports').field('kind', 'welders').attach('file', Buffer.from('PK\x03\x04garbage'), 'x.xlsx');
    expect(zip.status).toBe(400);
    const kind = await qa.post('/api/imports').field('kind', 'welds').attach('file', csv([['a'], ['b']]), 'x.csv');
    expect(kind.status).toBe(400);
    expect(errorOf(kind).fields).toHaveProperty('kind');
  });

  it('is for a signed-in QA manager only', async () => {
    const world = await makeWorld(api.ds);
    const foreman = await signIn(api.app, world.foreman.email, TEST_PASSWORD);
    await foreman.get('/api/imports').expect(403);
  });
});
