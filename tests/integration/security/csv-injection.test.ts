// No CSV the registry hands out holds a cell that runs as a formula (issue 13). Every route declared with a
// text/csv answer is called with a recipe below (a CSV route without one fails this test) on records whose
// text starts with =, +, -, @; each such text must come back behind an apostrophe, never bare. The one
// writer is apps/api/src/lib/csv.ts.
import Papa from 'papaparse';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { allRouteDocs } from '../../../apps/api/src/openapi/route-docs.js';
import { signIn, startTestApi, type TestApi } from '../../support/api-app.js';
import { makeWorld, TEST_PASSWORD } from '../../support/factories.js';
import { binaryBody, daysAgo, makeProcedure } from '../../support/api-records.js';
import { csv, importFile } from '../../support/imports.js';

const HOSTILE = ['=HYPERLINK("http://evil.example","open")', '+SUM(1+1)', '-2+3', '@cmd|calc'];

describe('CSV exports escape formulas', () => {
  let api: TestApi;
  let qa: Awaited<ReturnType<typeof signIn>>;
  let world: Awaited<ReturnType<typeof makeWorld>>;
  const period = { from: daysAgo(200).slice(0, 8) + '01', to: daysAgo(0) };

  beforeAll(async () => {
    api = await startTestApi();
    world = await makeWorld(api.ds);
    qa = await signIn(api.app, world.qa.email, TEST_PASSWORD);
    await makeProcedure(api.ds, world.org, { number: 'WPS-CSV' });
    await api.ds.query(`UPDATE welders SET name = $2 WHERE id = $1`, [world.weldersA[0]!.id, HOSTILE[0]]);
    await importFile(
      qa,
      'qualifications',
      csv([
        ['Stamp', 'Code', 'Process', 'Test date', 'WPS', 'Plate or pipe', 'Groove or fillet', 'Test position', 'Thickness', 'Backing'],
        ['A-01', 'ASME IX', 'SMAW', daysAgo(90), 'WPS-CSV', 'plate', 'groove', '1G', '3/8', 'yes'],
      ]),
      'hostile.csv',
    );
    const [q] = await api.ds.query<{ id: string }[]>(`SELECT id FROM qualifications WHERE welder_id = $1`, [world.weldersA[0]!.id]);
    await qa.post(`/api/qualifications/${q!.id}/revoke`).send({ revokedOn: daysAgo(5), reason: HOSTILE[2] }).expect(200);
    await qa
      .put('/api/continuity/grid')
      .send({ shopId: world.shopA.id, month: daysAgo(10).slice(0, 7), cells: [{ welderId: world.weldersA[0]!.id, process: 'SMAW', usedOn: daysAgo(10), jobReference: HOSTILE[1], note: HOSTILE[3] }] })
      .expect(200);
  }, 60_000);
  afterAll(() => api.close());

  const recipes: Record<string, () => Promise<Buffer>> = {
    'get /welds/job-summary.csv': async () => {
      // A weld whose job, number and note start like formulas, by a welder whose name does.
      const job = HOSTILE[1]!;
      await qa
        .post('/api/welds')
        .send({
          shopId: world.shopA.id,
          jobReference: job,
          weldNumber: HOSTILE[3],
          weldedOn: daysAgo(3),
          joint: { form: 'plate', weld: 'groove', position: 'F', thickness: { value: 0.5, unit: 'in' }, backing: true },
          passes: [{ welderId: world.weldersA[0]!.id, process: 'SMAW', layer: 'all' }],
        })
        .expect(201);
      return (await qa.get('/api/welds/job-summary.csv').query({ job }).buffer(true).parse(binaryBody).expect(200)).body as Buffer;
    },
    'get /reports/audit.csv': async () =>
      (await qa.get('/api/reports/audit.csv').query(period).buffer(true).parse(binaryBody).expect(200)).body as Buffer,
  };

  it('has a recipe for every CSV route, and no hostile text comes back bare', async () => {
    const csvRoutes = allRouteDocs()
      .filter((d) => typeof d.response === 'object' && d.response !== null && 'binary' in d.response && d.response.binary === 'text/csv')
      .map((d) => `${d.method} ${d.path}`);
    expect(csvRoutes.length).toBeGreaterThan(0);
    expect(csvRoutes.filter((r) => !recipes[r]), 'add a recipe for each CSV route to csv-injection.test.ts').toEqual([]);
    for (const route of csvRoutes) {
      const cells = Papa.parse<string[]>((await recipes[route]!()).toString('utf8'), { skipEmptyLines: true }).data.flat();
      for (const h of HOSTILE) {
        expect(cells.filter((c) => c.startsWith(h)), `${route}: ${h} bare`).toEqual([]);
      }
      // The hostile texts that the export carries are there, escaped.
      expect(cells.some((c) => c.startsWith(`'${HOSTILE[0]}`)), `${route} carries the welder's name`).toBe(true);
      for (const c of cells) expect(/^[=+@]/.test(c), `${route}: ${c}`).toBe(false);
    }
  });
});
