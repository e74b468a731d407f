// The WPS register in PostgreSQL: one query per list, the document joined in.
import type { EntityManager } from 'typeorm';
import type { z } from 'zod';
import type { Procedure, procedureListQuery } from '@beadroll/rules';
import { uploadJson } from '../uploads/uploads.repository.js';
import { ProcedureEntity, type ProcedureRow } from './procedure.entity.js';

type ListQuery = z.output<typeof procedureListQuery>;

const selectProcedure = `
  SELECT p.id, p.number, p.revision, p.code, p.processes, p.p_numbers AS "pNumbers", p.f_number AS "fNumber",
         p.positions, p.thickness_min AS "thicknessMin", p.thickness_max AS "thicknessMax", p.status,
         CASE WHEN d.id IS NULL THEN NULL ELSE ${uploadJson('d')} END AS document,
         p.notes, p.version, p.created_at AS "createdAt"
    FROM procedures p LEFT JOIN uploads d ON d.id = p.document_upload_id`;

type ProcedureRaw = Omit<Procedure, 'createdAt'> & { createdAt: Date };
const toProcedure = (r: ProcedureRaw): Procedure => ({ ...r, createdAt: r.createdAt.toISOString() });

const likePattern = (q: string) => `%${q.replace(/[\\%_]/g, (c) => `\\${c}`)}%`;

export async function listProcedures(db: EntityManager, organizationId: string, q: ListQuery) {
  const where = ['p.organization_id = $1'];
  const params: unknown[] = [organizationId];
  if (q.code) where.push(`p.code = $${params.push(q.code)}`);
  if (q.process) where.push(`$${params.push(q.process)} = ANY(p.processes)`);
  if (q.status !== 'all') where.push(`p.status = $${params.push(q.status)}`);
  if (q.q)
    where.push(`(p.number ILIKE $${params.push(likePattern(q.q))} OR p.notes ILIKE $${params.length})`);
  const rows: ProcedureRaw[] = await db.query(
    `${selectProcedure} WHERE ${where.join(' AND ')} ORDER BY p.number, p.revision DESC, p.id`,
    params,
  );
  return rows.map(toProcedure);
}

export async function findProcedure(
  db: EntityManager,
  organizationId: string,
  id: string,
): Promise<Procedure | null> {
  const rows: ProcedureRaw[] = await db.query(
    `${selectProcedure} WHERE p.organization_id = $1 AND p.id = $2`,
    [organizationId, id],
  );
  return rows[0] ? toProcedure(rows[0]) : null;
}

export type ProcedureFields = Pick<
  ProcedureRow,
  | 'number'
  | 'revision'
  | 'code'
  | 'processes'
  | 'pNumbers'
  | 'fNumber'
  | 'positions'
  | 'thicknessMin'
  | 'thicknessMax'
  | 'status'
  | 'documentUploadId'
  | 'notes'
>;

export async function lockProcedure(
  db: EntityManager,
  organizationId: string,
  id: string,
): Promise<(ProcedureFields & { id: string; version: number }) | null> {
  const rows: (ProcedureFields & { id: string; version: number })[] = await db.query(
    `SELECT id, number, revision, code, processes, p_numbers AS "pNumbers", f_number AS "fNumber", positions,
            thickness_min AS "thicknessMin", thickness_max AS "thicknessMax", status,
            document_upload_id AS "documentUploadId", notes, version
       FROM procedures WHERE organization_id = $1 AND id = $2 FOR UPDATE`,
    [organizationId, id],
  );
  return rows[0] ?? null;
}

export async function findByNumber(
  db: EntityManager,
  organizationId: string,
  number: string,
  revision: string,
): Promise<{ id: string } | null> {
  const rows: { id: string }[] = await db.query(
    `SELECT id FROM procedures WHERE organization_id = $1 AND number = $2 AND revision = $3`,
    [organizationId, number, revision],
  );
  return rows[0] ?? null;
}

export async function insertProcedure(
  db: EntityManager,
  organizationId: string,
  fields: ProcedureFields,
  at: Date,
): Promise<string> {
  const result = await db.insert(ProcedureEntity, {
    ...fields,
    organizationId,
    version: 1,
    createdAt: at,
    updatedAt: at,
  });
  return (result.identifiers[0] as { id: string }).id;
}

/** Applies the patch and bumps the version, only if the row is still at `version`. */
export async function updateProcedure(
  db: EntityManager,
  id: string,
  version: number,
  patch: Partial<ProcedureFields>,
  at: Date,
): Promise<boolean> {
  const result = await db
    .createQueryBuilder()
    .update(ProcedureEntity)
    .set({ ...patch, version: () => 'version + 1', updatedAt: at })
    .where('id = :id AND version = :version', { id, version })
    .execute();
  return result.affected === 1;
}

/** What a coupon needs to know of the WPS it names. */
export type ProcedureForCoupon = Pick<
  ProcedureRow,
  'id' | 'number' | 'revision' | 'code' | 'processes' | 'status'
>;

export async function procedureForCoupon(
  db: EntityManager,
  organizationId: string,
  id: string,
): Promise<ProcedureForCoupon | null> {
  const rows: ProcedureForCoupon[] = await db.query(
    `SELECT id, number, revision, code, processes, status FROM procedures WHERE organization_id = $1 AND id = $2`,
    [organizationId, id],
  );
  return rows[0] ?? null;
}
