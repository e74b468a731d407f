import { execFileSync } from 'node:child_process';
import Papa from 'papaparse';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { auditReportSchema, qualificationSchema, reviewQueueSchema, timelineSchema } from '@beadroll/rules';
import { errorOf, signIn, startTestApi, type TestApi } from '../../support/api-app.js';
import { makeWorld, TEST_PASSWORD } from '../../support/factories.js';
import { binaryBody, daysAgo, makeProcedure } from '../../support/api-records.js';
import { csv, importFile } from '../../support/imports.js';

const items = (body: unknown) => (body as { items: unknown[] }).items.map((i) => qualificationSchema.parse(i));

describe('the audit report', () => {
  let api: TestApi;
  beforeAll(async () => {
    api = await startTestApi();
  });
  afterAll(() => api.close());

  it('agrees with what the qualifications, timeline and review screens show, and renders as PDF and CSV', async () => {
    const world = await makeWorld(api.ds);
    const qa = await signIn(api.app, world.qa.email, TEST_PASSWORD);
    await makeProcedure(api.ds, world.org, { number: 'WPS-R1', processes: ['SMAW', 'GTAW'] });
    const [a01, a02] = world.weldersA;
    const b01 = world.weldersB[0]!;
    const row = (stamp: string, process: string, tested: string) => [stamp, 'ASME IX', process, tested, 'WPS-R1', 'plate', 'groove', '2G', '3/8', 'yes', '4'];
    await importFile(
      qa,
      'qualifications',
      csv([
        ['Stamp', 'Code', 'Process', 'Test date', 'WPS', 'Plate or pipe', 'Groove or fillet', 'Test position', 'Thickness', 'Backing', 'F-No.'],
        row('A-01', 'SMAW', daysAgo(150)), // kept in continuity by use
        row('A-02', 'SMAW', daysAgo(300)), // lapses (from memory: QW-322.1(a), six months without use), then welds: flagged
        row('B-01', 'GTAW', daysAgo(60)), // revoked
      ]),
      'report.csv',
    );
    const use = async (welderId: string, usedOn: string, shopId: string, job: string) =>
      qa.put('/api/continuity/grid').send({ shopId, month: usedOn.slice(0, 7), cells: [{ welderId, process: 'SMAW', usedOn, jobReference: job }] }).expect(200);
    await use(a01!.id, daysAgo(40), world.shopA.id, 'J-100');
    await use(a02!.id, daysAgo(20), world.shopA.id, 'J-200');
    const quals = items((await qa.get('/api/qualifications').expect(200)).body);
    const b01q = quals.find((q) => q.welder.id === b01.id)!;
    await qa.post(`/api/qualifications/${b01q.id}/revoke`).send({ revokedOn: daysAgo(10), reason: 'Two rejected production radiographs' }).expect(200);

    const from = daysAgo(330).slice(0, 8) + '01';
    const to = daysAgo(0);
    const res = await qa.get('/api/reports/audit').query({ from, to }).expect(200);
    const report = auditReportSchema.parse(res.body);

    // The register and its figures: the same state and lapse date as the qualifications API answers today.
    const now = items((await qa.get('/api/qualifications').expect(200)).body);
    expect(report.register.map((r) => r.qualificationId).sort()).toEqual(now.map((q) => q.id).sort());
    for (const r of report.register) {
      const q = now.find((x) => x.id === r.qualificationId)!;
      expect({ state: r.state, lapsesOn: r.lapsesOn }, r.stamp).toEqual({ state: q.status.state, lapsesOn: q.status.lapsesOn });
      expect(r.clauses).toMatch(/QW-/);
    }
    const counted = { current: 0, lapsing: 0, lapsed: 0, revoked: 0 };
    for (const q of now) counted[q.status.state]++;
    expect(report.summary.qualifications).toEqual(counted);
    expect(counted).toMatchObject({ lapsed: 1, revoked: 1 });

    // Lapses, use and flags: the same as each welder's timeline shows within the period.
    for (const w of [a01!, a02!, b01]) {
      const timeline = timelineSchema.parse((await qa.get(`/api/welders/${w.id}/timeline`).expect(200)).body);
      const within = (kind: string) =>
        timeline.processes.flatMap((p) => p.events.filter((e) => e.kind === kind && e.date >= from && e.date <= to).map((e) => `${p.process} ${e.date}`)).sort();
      const mine = <T extends { stamp: string; process: string }>(list: T[], date: (t: T) => string) =>
        list.filter((x) => x.stamp === w.stamp).map((x) => `${x.process} ${date(x)}`).sort();
      // The timeline draws a revocation as the end of continuity too; the report lists it once, as a revocation.
      const revoked = new Set(within('revocation'));
      expect(mine(report.lapses, (x) => x.lapsedOn), `lapses of ${w.stamp}`).toEqual(within('lapse').filter((l) => !revoked.has(l)));
      expect(mine(report.flaggedUse, (x) => x.usedOn), `flags of ${w.stamp}`).toEqual(within('flag'));
      expect(mine(report.revocations, (x) => x.revokedOn), `revocations of ${w.stamp}`).toEqual(within('revocation'));
      const usedMonths = report.matrix.rows
        .filter((r) => r.stamp === w.stamp)
        .flatMap((r) => r.cells.flatMap((c, i) => (c.includes('used') || c.includes('flagged') ? [`${r.process} ${report.matrix.months[i]}`] : [])))
        .sort();
      expect(usedMonths, `use of ${w.stamp}`).toEqual(within('use').map((u) => u.slice(0, -3)));
    }
    expect(report.lapses.map((l) => l.stamp)).toContain('A-02');
    // The lapsed welder's month of use is both flagged and lapsed in the matrix.
    const a02row = report.matrix.rows.find((r) => r.stamp === 'A-02')!;
    expect(a02row.cells[report.matrix.months.indexOf(daysAgo(20).slice(0, 7))]).toEqual(['flagged', 'lapsed']);
    // The review queue shows the same flagged use.
    const queue = reviewQueueSchema.parse((await qa.get('/api/continuity/review').expect(200)).body);
    expect(report.flaggedUse.map((f) => f.entryId).sort()).toEqual(queue.items.map((i) => i.id).sort());
    expect(report.summary.flaggedUse).toEqual({ pending: 1, reviewed: 0 });
    expect(report.revocations).toEqual([expect.objectContaining({ stamp: 'B-01', reason: 'Two rejected production radiographs' })]);

    // One shop: only its home welders.
    const shopB = auditReportSchema.parse((await qa.get('/api/reports/audit').query({ from, to, shopId: world.shopB.id }).expect(200)).body);
    expect(new Set(shopB.register.map((r) => r.stamp))).toEqual(new Set(['B-01']));
    expect(shopB.shop).toMatchObject({ code: 'BB' });

    const pdf = await qa.get('/api/reports/audit.pdf').query({ from, to }).buffer(true).parse(binaryBody).expect(200);
    expect(pdf.headers['content-type']).toBe('application/pdf');
    const text = execFileSync('pdftotext', ['-layout', '-', '-'], { input: pdf.body as Buffer }).toString();
    expect(text).toMatch(/Audit report/);
    expect(text).toMatch(/A-02/);
    expect(text).toMatch(/Two rejected production radiographs/);
    const fonts = execFileSync('pdffonts', ['-'], { input: pdf.body as Buffer }).toString();
    expect(fonts).toMatch(/SourceSans3/i);
    expect(fonts).not.toMatch(/Helvetica/);

    const csvRes = await qa.get('/api/reports/audit.csv').query({ from, to }).buffer(true).parse(binaryBody).expect(200);
    expect(csvRes.headers['content-type']).toMatch(/^text\/csv/);
    const parsed = Papa.parse<string[]>((csvRes.body as Buffer).toString('utf8'), { skipEmptyLines: true }).data;
    expect(parsed[0]![0]).toBe('section');
    expect(parsed.filter((r) => r[0] === 'register')).toHaveLength(report.register.length);
    expect(parsed.filter((r) => r[0] === 'lapse')).toHaveLength(report.lapses.length);
    expect(parsed.filter((r) => r[0] === 'flagged use')).toHaveLength(report.flaggedUse.length);

    // Clear refusals.
    const backwards = await qa.get('/api/reports/audit').query({ from: to, to: from });
    expect(backwards.status).toBe(400);
    expect(errorOf(backwards).fields).toHaveProperty('to');
    const foreman = await signIn(api.app, world.foreman.email, TEST_PASSWORD);
    expect((await foreman.get('/api/reports/audit').query({ from, to })).status).toBe(403);
  });
});
