// Driving an import through the API as the browser does: upload, check with a mapping, commit, poll.
import type request from 'supertest';
import { expect } from 'vitest';
import { importSchema, type Import, type ImportDateFormat, type ImportMapping } from '@beadroll/rules';

type Agent = ReturnType<typeof request.agent>;

export async function upload(agent: Agent, kind: string, body: Buffer, fileName: string): Promise<Import> {
  const res = await agent.post('/api/imports').field('kind', kind).attach('file', body, fileName);
  expect(res.status, JSON.stringify(res.body)).toBe(201);
  return importSchema.parse(res.body);
}

export async function check(agent: Agent, id: string, mapping: ImportMapping, dateFormat: ImportDateFormat = 'iso') {
  const res = await agent.post(`/api/imports/${id}/check`).send({ mapping, dateFormat });
  expect(res.status, JSON.stringify(res.body)).toBe(200);
  return importSchema.parse(res.body);
}

/** Polls until the import is no longer running; returns the last view and every progress seen. */
export async function waitForImport(agent: Agent, id: string, timeoutMs = 120_000) {
  const seen: Import['progress'][] = [];
  const until = Date.now() + timeoutMs;
  for (;;) {
    const view = importSchema.parse((await agent.get(`/api/imports/${id}`).expect(200)).body);
    seen.push(view.progress);
    if (view.status !== 'running') return { view, seen };
    if (Date.now() > until) throw new Error(`import ${id} still running after ${timeoutMs} ms`);
    await new Promise((r) => setTimeout(r, 100));
  }
}

export async function commit(agent: Agent, id: string) {
  const res = await agent.post(`/api/imports/${id}/commit`);
  expect(res.status, JSON.stringify(res.body)).toBe(202);
  return waitForImport(agent, id);
}

export const csv = (rows: string[][]) =>
  Buffer.from(rows.map((r) => r.map((c) => (/[",\n]/.test(c) ? `"${c.replace(/"/g, '""')}"` : c)).join(',')).join('\r\n'));

/** Uploads a file, checks it with the mapping the API suggests (or the one given) and commits it. */
export async function importFile(agent: Agent, kind: string, body: Buffer, fileName: string, mapping?: ImportMapping) {
  const staged = await upload(agent, kind, body, fileName);
  const checked = await check(agent, staged.id, mapping ?? staged.mapping);
  expect(checked.report?.errors, JSON.stringify(checked.report?.issues)).toBe(0);
  return (await commit(agent, staged.id)).view;
}
