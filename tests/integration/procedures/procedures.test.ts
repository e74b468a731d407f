import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { procedureSchema } from '@beadroll/rules';
import { bodyOf, errorOf, signIn, startTestApi, type TestApi } from '../../support/api-app.js';
import { auditRows, makeOtherCompany, makeWorld, TEST_PASSWORD } from '../../support/factories.js';

const wps = (over: Record<string, unknown> = {}) => ({
  number: 'HP-G100',
  revision: 'A',
  code: 'asme-ix',
  processes: ['GTAW', 'SMAW'],
  pNumbers: ['1'],
  fNumber: 6,
  positions: ['F', 'H'],
  thicknessMin: { value: 1.5, unit: 'mm' },
  thicknessMax: { value: 19, unit: 'mm' },
  ...over,
});

describe('procedures (WPS register)', () => {
  let api: TestApi;
  beforeAll(async () => {
    api = await startTestApi();
  });
  afterAll(() => api.close());

  it('adds a WPS, lists and filters the register, and refuses a second number + revision on fields.revision', async () => {
    const world = await makeWorld(api.ds);
    const qa = await signIn(api.app, world.qa.email, TEST_PASSWORD);
    const p = bodyOf(procedureSchema, await qa.post('/api/procedures').send(wps()).expect(201));
    expect(p).toMatchObject({ number: 'HP-G100', status: 'active', version: 1, document: null, notes: '' });
    await qa
      .post('/api/procedures')
      .send(wps({ number: 'HP-F300', code: 'aws-d1.1', processes: ['FCAW'] }))
      .expect(201);
    const dup = await qa.post('/api/procedures').send(wps());
    expect(dup.status).toBe(400);
    expect(errorOf(dup).fields?.revision).toBe('WPS HP-G100 rev A is already in the register');
    const numbers = async (q: string) =>
      ((await qa.get(`/api/procedures${q}`).expect(200)).body as { items: { number: string }[] }).items.map(
        (i) => i.number,
      );
    expect(await numbers('')).toEqual(['HP-F300', 'HP-G100']);
    expect(await numbers('?code=aws-d1.1')).toEqual(['HP-F300']);
    expect(await numbers('?process=GTAW')).toEqual(['HP-G100']);
    expect(await numbers('?q=g1')).toEqual(['HP-G100']);
    expect(await numbers('?status=superseded')).toEqual([]);
    expect((await auditRows(api.ds, p.id)).map((a) => a.action)).toEqual(['procedure.created']);
  });

  it('refuses a thickness range upside down', async () => {
    const world = await makeWorld(api.ds);
    const qa = await signIn(api.app, world.qa.email, TEST_PASSWORD);
    const res = await qa
      .post('/api/procedures')
      .send(wps({ thicknessMin: { value: 1, unit: 'in' }, thicknessMax: { value: 3, unit: 'mm' } }));
    expect(errorOf(res).fields).toHaveProperty('thicknessMax');
  });

  it('supersedes by PATCH with the version, changing only what is named; a stale version gets 409', async () => {
    const world = await makeWorld(api.ds);
    const qa = await signIn(api.app, world.qa.email, TEST_PASSWORD);
    const p = bodyOf(procedureSchema, await qa.post('/api/procedures').send(wps()).expect(201));
    const sup = bodyOf(
      procedureSchema,
      await qa.patch(`/api/procedures/${p.id}`).send({ status: 'superseded', version: 1 }).expect(200),
    );
    expect(sup).toMatchObject({
      status: 'superseded',
      version: 2,
      processes: ['GTAW', 'SMAW'],
      positions: ['F', 'H'],
      fNumber: 6,
    });
    const stale = await qa.patch(`/api/procedures/${p.id}`).send({ notes: 'late edit', version: 1 });
    expect(stale.status).toBe(409);
    expect(errorOf(stale).code).toBe('conflict');
    const audit = await auditRows(api.ds, p.id);
    expect(audit.map((a) => a.action)).toEqual(['procedure.created', 'procedure.superseded']);
    expect(audit[1]).toMatchObject({ before: { status: 'active' }, after: { status: 'superseded' } });
  });

  it('answers two simultaneous saves of one version with one 200 and one 409, never a silent overwrite', async () => {
    const world = await makeWorld(api.ds);
    const qa = await signIn(api.app, world.qa.email, TEST_PASSWORD);
    const p = bodyOf(procedureSchema, await qa.post('/api/procedures').send(wps()).expect(201));
    const [a, b] = await Promise.all([
      qa.patch(`/api/procedures/${p.id}`).send({ notes: 'first editor', version: 1 }),
      qa.patch(`/api/procedures/${p.id}`).send({ notes: 'second editor', version: 1 }),
    ]);
    expect([a.status, b.status].sort()).toEqual([200, 409]);
    const saved = bodyOf(procedureSchema, await qa.get(`/api/procedures/${p.id}`).expect(200));
    expect(saved.version).toBe(2);
    expect(saved.notes).toBe(a.status === 200 ? 'first editor' : 'second editor');
  });

  it('lets a foreman read the register but not write; a welder gets 403; another company gets 404', async () => {
    const world = await makeWorld(api.ds);
    const qa = await signIn(api.app, world.qa.email, TEST_PASSWORD);
    const p = bodyOf(procedureSchema, await qa.post('/api/procedures').send(wps()).expect(201));
    const foreman = await signIn(api.app, world.foreman.email, TEST_PASSWORD);
    await foreman.get(`/api/procedures/${p.id}`).expect(200);
    expect((await foreman.post('/api/procedures').send(wps({ number: 'X' }))).status).toBe(403);
    expect((await foreman.patch(`/api/procedures/${p.id}`).send({ notes: 'x', version: 1 })).status).toBe(
      403,
    );
    const welder = await signIn(api.app, world.welder.email, TEST_PASSWORD);
    expect((await welder.get('/api/procedures')).status).toBe(403);
    const other = await makeOtherCompany(api.ds);
    const otherQa = await signIn(api.app, other.qa.email, TEST_PASSWORD);
    expect((await otherQa.get(`/api/procedures/${p.id}`)).status).toBe(404);
    expect((await otherQa.patch(`/api/procedures/${p.id}`).send({ notes: 'x', version: 1 })).status).toBe(
      404,
    );
  });
});
