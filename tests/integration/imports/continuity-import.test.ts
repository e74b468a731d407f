import ExcelJS from 'exceljs';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { importSchema } from '@beadroll/rules';
import { signIn, startTestApi, type TestApi } from '../../support/api-app.js';
import { makeWorld, TEST_PASSWORD } from '../../support/factories.js';
import { check, commit, csv, upload, waitForImport } from '../../support/imports.js';

/** An .xlsx as a spreadsheet program writes it: a real date cell, a formula with its cached result. */
async function workbook(rows: (string | Date | { formula: string; result: string })[][]): Promise<Buffer> {
  const wb = new ExcelJS.Workbook();
  const ws = wb.addWorksheet('Continuity 2026');
  for (const r of rows) ws.addRow(r);
  return Buffer.from(await wb.xlsx.writeBuffer());
}

describe('importing continuity history', () => {
  let api: TestApi;
  beforeAll(async () => {
    api = await startTestApi();
  });
  afterAll(() => api.close());

  it('reads an .xlsx (dates as dates, formulas as their values), reports bad rows, then commits and refreshes the continuity state once', async () => {
    const world = await makeWorld(api.ds);
    const qa = await signIn(api.app, world.qa.email, TEST_PASSWORD);
    const header = ['Stamp', 'Process', 'Date', 'Job', 'Shop'];
    const bad = await workbook([
      header,
      ['A-01', 'SMAW', new Date(Date.UTC(2026, 0, 14)), { formula: 'CONCATENATE("J-","4471")', result: 'J-4471' }, 'AA'],
      ['A-01', 'smaw', '03/02/2026', 'J-4480', ''],
      ['Q-99', 'GTAW', '2026-02', 'J-1', ''],
      ['A-02', 'SMAW', '31/02/2026', 'J-2', ''],
      ['B-01', 'TIG', '2026-01-05', '', 'CC'],
    ]);
    const up = await upload(qa, 'continuity', bad, 'continuity 2026.xlsx');
    expect(up.fileType).toBe('xlsx');
    expect(up.mapping).toEqual({ stamp: 'Stamp', process: 'Process', date: 'Date', job: 'Job', shop: 'Shop', note: null });
    const checked = await check(qa, up.id, up.mapping, 'day-first');
    expect(checked.report!.issues).toEqual([
      { row: 4, column: 'Stamp', message: 'No welder with stamp Q-99 in your company; import or add the welder first' },
      // A month alone is refused: use on an unknown day of a lapse month may have come after the lapse
      // (issue 8: month-only use must never count where it could be wrong).
      { row: 4, column: 'Date', message: expect.stringMatching(/“2026-02” is a month: give the day of use/) as string },
      { row: 5, column: 'Date', message: expect.stringMatching(/“31\/02\/2026” is not a date as day\/month\/year/) as string },
      { row: 6, column: 'Shop', message: 'No shop “CC” in your company' },
      { row: 6, column: 'Process', message: expect.stringMatching(/Choose one of SMAW/) as string },
      { row: 6, column: 'Job', message: expect.stringMatching(/job or traveler/) as string },
    ]);
    expect(checked.report).toMatchObject({ rows: 5, errors: 3, new: 2 });

    const good = await workbook([
      header,
      ['A-01', 'SMAW', new Date(Date.UTC(2026, 0, 14)), { formula: 'CONCATENATE("J-","4471")', result: 'J-4471' }, 'AA'],
      ['A-01', 'smaw', '03/02/2026', 'J-4480', ''],
      ['A-01', 'SMAW', '17/02/2026', 'J-4490', ''],
      ['B-01', 'GTAW', '20/01/2026', '=HYPERLINK("x")', 'BB'],
    ]);
    const up2 = await upload(qa, 'continuity', good, 'continuity 2026.xlsx');
    expect(up2.dateFormat).toBe('day-first');
    const checked2 = await check(qa, up2.id, up2.mapping, 'day-first');
    expect(checked2.report).toMatchObject({ errors: 0, new: 3, unchanged: 0, changed: 0 });
    expect(checked2.report!.notes.join(' ')).toMatch(/1 row\(s\) fall in the same welder, process, shop and month/);
    const { view } = await commit(qa, up2.id);
    expect(view.status).toBe('committed');
    const entries = await api.ds.query<{ stamp: string; process: string; usedOn: string; job: string }[]>(
      `SELECT w.stamp, e.process, to_char(e.used_on, 'YYYY-MM-DD') AS "usedOn", e.job_reference AS job
         FROM continuity_entries e JOIN welders w ON w.id = e.welder_id
        WHERE e.organization_id = $1 ORDER BY w.stamp, e.used_on`,
      [world.org.id],
    );
    expect(entries).toEqual([
      { stamp: 'A-01', process: 'SMAW', usedOn: '2026-01-14', job: 'J-4471' },
      { stamp: 'A-01', process: 'SMAW', usedOn: '2026-02-17', job: 'J-4490' },
      { stamp: 'B-01', process: 'GTAW', usedOn: '2026-01-20', job: '=HYPERLINK("x")' },
    ]);

    const again = await upload(qa, 'continuity', good, 'continuity 2026.xlsx');
    expect((await check(qa, again.id, again.mapping, 'day-first')).report).toMatchObject({ new: 0, changed: 0, unchanged: 3 });
  });

  it('reads the same text date differently only by the format chosen, never by guessing', async () => {
    const world = await makeWorld(api.ds);
    const qa = await signIn(api.app, world.qa.email, TEST_PASSWORD);
    const file = csv([
      ['Stamp', 'Process', 'Date', 'Job'],
      ['A-01', 'SMAW', '03/02/2026', 'J-1'],
    ]);
    const up = await upload(qa, 'continuity', file, 'c.csv');
    await check(qa, up.id, up.mapping, 'us');
    await commit(qa, up.id);
    const [row] = await api.ds.query<{ d: string }[]>(
      `SELECT to_char(used_on, 'YYYY-MM-DD') AS d FROM continuity_entries WHERE organization_id = $1`,
      [world.org.id],
    );
    expect(row!.d).toBe('2026-03-02');
    const iso = await upload(qa, 'continuity', file, 'c.csv');
    const checked = await check(qa, iso.id, iso.mapping, 'iso');
    expect(checked.report!.issues[0]!.message).toMatch(/not a date as YYYY-MM-DD/);
  });

  it('a cancelled import writes nothing', async () => {
    const world = await makeWorld(api.ds);
    const qa = await signIn(api.app, world.qa.email, TEST_PASSWORD);
    const rows = [['Stamp', 'Process', 'Date', 'Job']];
    for (let m = 0; m < 24; m++)
      for (const s of ['A-01', 'A-02', 'B-01', 'B-02'])
        for (const p of ['SMAW', 'GTAW', 'GMAW', 'FCAW'])
          rows.push([s, p, `${2024 + Math.floor(m / 12)}-${String((m % 12) + 1).padStart(2, '0')}-03`, `J-${m}`]);
    const up = await upload(qa, 'continuity', csv(rows), 'big.csv');
    await check(qa, up.id, up.mapping, 'iso');
    await qa.post(`/api/imports/${up.id}/commit`).expect(202);
    // Cancel asked before the run's first progress report (it reads the file from the object store first).
    const cancel = await qa.post(`/api/imports/${up.id}/cancel`);
    if (cancel.status === 409) return expect(importSchema.parse((await qa.get(`/api/imports/${up.id}`)).body).status).toBe('committed');
    expect(cancel.status).toBe(200);
    const { view } = await waitForImport(qa, up.id);
    expect(view.status).toBe('cancelled');
    expect(view.error).toMatch(/nothing was written/);
    const [{ n }] = await api.ds.query<[{ n: number }]>(`SELECT count(*)::int AS n FROM continuity_entries WHERE organization_id = $1`, [world.org.id]);
    expect(n).toBe(0);
    const audit = await api.ds.query<unknown[]>(`SELECT 1 FROM audit_events WHERE organization_id = $1 AND entity_type = 'import'`, [world.org.id]);
    expect(audit).toHaveLength(0);
  });
});
