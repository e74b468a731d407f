import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { paperRecordListSchema, paperRecordSchema, qualificationSchema, qualifiedRanges } from '@beadroll/rules';
import { errorOf, signIn, startTestApi, type TestApi } from '../../support/api-app.js';
import { makeWorld, TEST_PASSWORD } from '../../support/factories.js';
import { binaryBody, daysAgo, makeProcedure } from '../../support/api-records.js';
import { check, commit, csv, upload } from '../../support/imports.js';

const header = [
  'Welder', 'Code', 'Process', 'Date of test', 'WPS No', 'Plate or pipe', 'Groove or fillet', 'Position', 'Thickness',
  'NPS', 'Sch', 'Backing', 'F-No.', 'Positions qualified', 'Thickness qualified', 'Progression',
];
const inch = (value: number) => ({ value, unit: 'in' as const });

describe('importing existing qualifications (paper WPQs)', () => {
  let api: TestApi;
  beforeAll(async () => {
    api = await startTestApi();
  });
  afterAll(() => api.close());

  it('reports every bad row in the dry run and writes nothing; commits the fixed file with ranges computed by the rules, keeps the paper ranges where they differ for the QA manager to settle; re-importing changes nothing', async () => {
    const world = await makeWorld(api.ds);
    const qa = await signIn(api.app, world.qa.email, TEST_PASSWORD);
    await makeProcedure(api.ds, world.org, { number: 'WPS-101', processes: ['SMAW', 'GTAW'] });
    await makeProcedure(api.ds, world.org, { number: 'WPS-D1', code: 'aws-d1.1', processes: ['FCAW'] });
    const tested = daysAgo(60);
    const bad = csv([
      header,
      ['A-01', 'ASME IX', 'SMAW', tested, 'WPS-101', 'plate', 'groove', '2G', '3/8', '', '', 'yes', '4', 'F, H', 'up to 3/4 in'],
      ['Z-99', 'ASME IX', 'SMAW', tested, 'WPS-101', 'plate', 'groove', '2G', '3/8', '', '', 'yes', '4', '', ''],
      ['A-02', 'ASME 8', 'SMAW', tested, 'WPS-101', 'plate', 'groove', '2G', '3/8', '', '', 'yes', '4', '', ''],
      ['A-02', 'ASME IX', 'SMAW', '2099-01-01', 'WPS-404', 'plate', 'groove', '2G', '3/8 furlong', '', '', 'maybe', '4', '', ''],
      ['A-02', 'ASME IX', 'SMAW', tested, 'WPS-D1', 'plate', 'groove', '2G', '3/8', '', '', 'yes', '4', '1G and 2G', ''],
      ['A-01', 'ASME IX', 'SMAW', tested, 'WPS-101', 'plate', 'groove', '2G', '3/8', '', '', 'yes', '4', '', ''],
    ]);
    const staged = await upload(qa, 'qualifications', bad, 'binder 3.csv');
    const mapping = {
      stamp: 'Welder', code: 'Code', process: 'Process', testedOn: 'Date of test', wps: 'WPS No', form: 'Plate or pipe',
      weld: 'Groove or fillet', position: 'Position', thickness: 'Thickness', nps: 'NPS', schedule: 'Sch', backing: 'Backing',
      fNumber: 'F-No.', groovePositions: 'Positions qualified', thicknessRange: 'Thickness qualified', progression: 'Progression',
    };
    // Obvious headers are matched; the company's own ("Date of test", "WPS No", "Sch") by the saved mapping below.
    expect(staged.mapping).toMatchObject({ stamp: 'Welder', code: 'Code', process: 'Process', backing: 'Backing', groovePositions: 'Positions qualified' });
    const r = (await check(qa, staged.id, mapping)).report!;
    expect(r.issues).toEqual([
      { row: 3, column: 'Welder', message: 'No welder with stamp Z-99 in your company; import or add the welder first' },
      { row: 4, column: 'Code', message: expect.stringMatching(/“ASME 8” is not a code/) as string },
      { row: 5, column: 'Date of test', message: '2099-01-01 is in the future' },
      { row: 5, column: 'WPS No', message: expect.stringMatching(/No WPS WPS-404 in your register/) as string },
      { row: 5, column: 'Thickness', message: expect.stringMatching(/"3\/8 furlong" is not a length/) as string },
      { row: 5, column: 'Backing', message: '“maybe”: write yes or no' },
      { row: 6, column: 'WPS No', message: expect.stringMatching(/WPS-D1 rev A is for AWS D1.1, not ASME IX/) as string },
      { row: 6, column: 'Positions qualified', message: expect.stringMatching(/“1G and 2G” is not a list of positions/) as string },
      { row: 7, column: null, message: `A-01 SMAW ASME IX tested ${tested} is already on row 2 of this file` },
    ]);
    expect(r).toMatchObject({ rows: 6, errors: 5, new: 1 });
    const refused = await qa.post(`/api/imports/${staged.id}/commit`);
    expect(refused.status).toBe(400);
    expect(errorOf(refused).message).toMatch(/problems/);
    const count = async () =>
      (await api.ds.query<{ n: number }[]>(`SELECT count(*)::int AS n FROM qualifications WHERE organization_id = $1`, [world.org.id]))[0]!.n;
    expect(await count()).toBe(0);

    const good = csv([
      header,
      // agrees with the rules, written the paper's way (from memory: QW-461.9 plate 2G → groove F, H; QW-452.1(b) 2t = 3/4 in)
      ['A-01', 'ASME IX', 'SMAW', tested, 'WPS-101', 'plate', 'groove', '2G', '3/8', '', '', 'yes', '4', 'flat, horizontal', 'max 19 mm'],
      // states more positions and less thickness than the rules compute: both kept, to be settled
      ['A-02', 'ASME Section IX', 'smaw', tested, 'WPS-101', 'Plate', 'Groove', '2g', '3/8 in', '', '', 'Y', 'F4', 'All', 'up to 1/2 in'],
      // pipe by NPS and schedule (published: ASME B36.10M — NPS 2 Sch 80 is 2.375 in OD, 0.218 in wall)
      ['B-01', 'ASME IX', 'GTAW', tested, 'WPS-101', 'pipe', 'groove', '6G', '', '2', '80', 'no', '6', '', '', 'uphill'],
    ]);
    const staged2 = await upload(qa, 'qualifications', good, 'binder 3.csv');
    expect(staged2.mapping).toEqual(expect.objectContaining(mapping));
    const r2 = (await check(qa, staged2.id, mapping)).report!;
    expect(r2, JSON.stringify(r2.issues)).toMatchObject({ errors: 0, new: 3, unchanged: 0, changed: 0 });
    expect(r2.notes.join(' ')).toMatch(/1 qualification\(s\) state ranges other than the rules compute/);
    const { view } = await commit(qa, staged2.id);
    expect(view.status).toBe('committed');

    const rows = await api.ds.query<{ stamp: string; id: string; ranges: unknown; coupon: unknown; result: string; certifiedOn: string; lapsesOn: string }[]>(
      `SELECT w.stamp, q.id, q.ranges, c.coupon, c.result, to_char(q.certified_on, 'YYYY-MM-DD') AS "certifiedOn",
              to_char(s.lapses_on, 'YYYY-MM-DD') AS "lapsesOn"
         FROM qualifications q JOIN welders w ON w.id = q.welder_id JOIN coupons c ON c.id = q.coupon_id
         JOIN continuity_states s ON s.welder_id = q.welder_id AND s.process = q.process AND s.code = q.code
        WHERE q.organization_id = $1 ORDER BY w.stamp`,
      [world.org.id],
    );
    expect(rows.map((x) => x.stamp)).toEqual(['A-01', 'A-02', 'B-01']);
    for (const x of rows) {
      // The ranges are the rules' own, from the coupon as stored.
      expect(x.ranges).toEqual(JSON.parse(JSON.stringify(qualifiedRanges(x.coupon as Parameters<typeof qualifiedRanges>[0]))));
      expect(x.result).toBe('accept');
      expect(x.certifiedOn).toBe(tested);
      // from memory: QW-322.1(a) — six months from the test, the pair's last evidence
      const d = new Date(`${tested}T00:00:00Z`);
      d.setUTCMonth(d.getUTCMonth() + 6);
      expect(x.lapsesOn.slice(0, 7)).toBe(d.toISOString().slice(0, 7));
    }
    expect(rows[2]!.coupon).toMatchObject({ form: 'pipe', position: '6G', outsideDiameter: inch(2.375), thickness: inch(0.218), backing: false });

    // The qualification reads like any other (status from continuity), and its WPQ record renders.
    const a02 = rows[1]!;
    const q = qualificationSchema.parse((await qa.get(`/api/qualifications/${a02.id}`).expect(200)).body);
    expect(q.status.state).toBe('current');
    const pdf = await qa.get(`/api/qualifications/${a02.id}/wpq.pdf`).buffer(true).parse(binaryBody).expect(200);
    expect((pdf.body as Buffer).subarray(0, 5).toString()).toBe('%PDF-');

    // Only A-02's record differs; it waits to be settled.
    const open = paperRecordListSchema.parse((await qa.get('/api/paper-records').expect(200)).body);
    expect(open.items).toHaveLength(1);
    expect(open.items[0]).toMatchObject({
      qualificationId: a02.id,
      welder: { stamp: 'A-02' },
      importId: staged2.id,
      line: 3,
      settlement: null,
      differences: [
        { variable: 'groovePositions', computed: 'F, H', stated: 'All' },
        { variable: 'thickness', computed: 'up to 0.75 in', stated: 'up to 1/2 in' },
      ],
    });
    const noNote = await qa.post(`/api/paper-records/${a02.id}/settle`).send({ settlement: 'narrowed', note: '' });
    expect(noNote.status).toBe(400);
    expect(errorOf(noNote).fields).toHaveProperty('note');
    const settled = paperRecordSchema.parse(
      (await qa.post(`/api/paper-records/${a02.id}/settle`).send({ settlement: 'narrowed', note: 'The signed record governs' }).expect(200)).body,
    );
    expect(settled).toMatchObject({ settlement: 'narrowed', settledBy: 'Quinn Assay', settlementNote: 'The signed record governs' });
    const after = qualificationSchema.parse((await qa.get(`/api/qualifications/${a02.id}`).expect(200)).body);
    const ranges = after.ranges as ReturnType<typeof qualifiedRanges>;
    // Narrowed to what both allow: never the paper's wider "all positions".
    expect(ranges.positions.groove).toEqual(['F', 'H']);
    expect(ranges.thickness.max).toEqual(inch(0.5));
    expect(ranges.limits.some((l) => l.clause.startsWith('paper WPQ record'))).toBe(true);
    expect((await qa.post(`/api/paper-records/${a02.id}/settle`).send({ settlement: 'computed', note: 'again' })).status).toBe(409);
    expect(paperRecordListSchema.parse((await qa.get('/api/paper-records').expect(200)).body).items).toHaveLength(0);

    const audit = await api.ds.query<{ action: string; entityType: string }[]>(
      `SELECT action, entity_type AS "entityType" FROM audit_events WHERE organization_id = $1 ORDER BY at, id`,
      [world.org.id],
    );
    expect(audit.map((a) => a.action)).toEqual(['import.committed', 'qualification.paper-ranges-settled']);

    // The same file again: every row unchanged, nothing written.
    const staged3 = await upload(qa, 'qualifications', good, 'binder 3 again.csv');
    expect((await check(qa, staged3.id, mapping)).report).toMatchObject({ errors: 0, new: 0, unchanged: 3, changed: 0 });
    expect((await commit(qa, staged3.id)).view.status).toBe('committed');
    expect(await count()).toBe(3);

    // The same welder, code, process and date with other variables is refused: certified records are never edited.
    const other = csv([header, ['A-01', 'ASME IX', 'SMAW', tested, 'WPS-101', 'plate', 'groove', '2G', '1/2', '', '', 'yes', '4', '', '']]);
    const staged4 = await upload(qa, 'qualifications', other, 'binder 4.csv');
    expect((await check(qa, staged4.id, mapping)).report!.issues).toEqual([
      { row: 2, column: null, message: expect.stringMatching(/already on record with other coupon variables/) as string },
    ]);
  });

  it('is refused to a foreman and to another company', async () => {
    const world = await makeWorld(api.ds);
    const foreman = await signIn(api.app, world.foreman.email, TEST_PASSWORD);
    expect((await foreman.get('/api/paper-records')).status).toBe(403);
    const qa = await signIn(api.app, world.qa.email, TEST_PASSWORD);
    expect((await qa.post(`/api/paper-records/${crypto.randomUUID()}/settle`).send({ settlement: 'computed', note: 'x' })).status).toBe(404);
  });
});
