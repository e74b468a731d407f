// Upload rows in PostgreSQL. Who may read an upload follows what it is attached to: the QA manager every
// upload of the company, a foreman those of coupons of welders in their shops (and WPS documents, which
// the register shows them), a welder those of their own coupons.
import type { EntityManager } from 'typeorm';
import type { Upload } from '@beadroll/rules';
import type { Actor } from '../lib/scope.js';
import { UploadEntity, type UploadRow } from './upload.entity.js';

export const uploadColumns = `u.id, u.organization_id AS "organizationId", u.storage_key AS "storageKey",
  u.file_name AS "fileName", u.content_type AS "contentType", u.size, u.sha256, u.kind,
  u.uploaded_by AS "uploadedBy", u.created_at AS "createdAt"`;

/** The JSON of an upload as the API shows it, for embedding in other rows' queries (alias `u`). */
export const uploadJson = (alias: string) =>
  `json_build_object('id', ${alias}.id, 'fileName', ${alias}.file_name, 'contentType', ${alias}.content_type,
    'size', ${alias}.size, 'kind', ${alias}.kind,
    'createdAt', to_char(${alias}.created_at AT TIME ZONE 'UTC', 'YYYY-MM-DD"T"HH24:MI:SS.MS"Z"'))`;

export const toUpload = (r: UploadRow): Upload => ({
  id: r.id,
  fileName: r.fileName,
  contentType: r.contentType,
  size: r.size,
  kind: r.kind as Upload['kind'],
  createdAt: r.createdAt.toISOString(),
});

export async function insertUpload(db: EntityManager, row: Omit<UploadRow, 'id'>): Promise<string> {
  const result = await db.insert(UploadEntity, row);
  return (result.identifiers[0] as { id: string }).id;
}

export async function findUpload(db: EntityManager, actor: Actor, id: string): Promise<UploadRow | null> {
  const rows: UploadRow[] = await db.query(
    `SELECT ${uploadColumns} FROM uploads u
      WHERE u.organization_id = $1 AND u.id = $2 AND (
        $3 = 'qa_manager'
        OR EXISTS (
          SELECT 1 FROM coupon_uploads cu
            JOIN coupons c ON c.id = cu.coupon_id
            JOIN welders w ON w.id = c.welder_id
           WHERE cu.upload_id = u.id
             AND (($3 = 'foreman' AND w.home_shop_id = ANY($4::uuid[])) OR ($3 = 'welder' AND w.id = $5)))
        OR ($3 = 'foreman' AND EXISTS (SELECT 1 FROM procedures p WHERE p.document_upload_id = u.id)))`,
    [actor.organizationId, id, actor.role, actor.shopIds, actor.welderId],
  );
  return rows[0] ?? null;
}

/** Of the given ids, those that are uploads of the organization. */
export async function uploadsOfOrganization(
  db: EntityManager,
  organizationId: string,
  ids: string[],
): Promise<Map<string, Upload>> {
  if (ids.length === 0) return new Map();
  const rows: UploadRow[] = await db.query(
    `SELECT ${uploadColumns} FROM uploads u WHERE u.organization_id = $1 AND u.id = ANY($2::uuid[])`,
    [organizationId, ids],
  );
  return new Map(rows.map((r) => [r.id, toUpload(r)]));
}

/** Marks pending uploads of the organization as attached to a record being saved (caller's transaction). */
export async function attachUploads(db: EntityManager, organizationId: string, ids: string[], at: Date): Promise<void> {
  if (ids.length === 0) return;
  await db.query(
    `UPDATE uploads SET attached_at = $3
      WHERE organization_id = $1 AND id = ANY($2::uuid[]) AND attached_at IS NULL`,
    [organizationId, ids, at],
  );
}

/**
 * Deletes up to `limit` uploads pending since before `before` and named by no record, skipping rows that a
 * save in progress holds; returns what was deleted.
 */
export async function deletePendingUploads(
  db: EntityManager,
  before: Date,
  limit: number,
): Promise<{ id: string; organizationId: string; storageKey: string; fileName: string; kind: string }[]> {
  return db.query(
    `WITH gone AS (
     DELETE FROM uploads d
      WHERE d.id IN (
        SELECT u.id FROM uploads u
         WHERE u.attached_at IS NULL AND u.created_at < $1
           AND NOT EXISTS (SELECT 1 FROM coupon_uploads cu WHERE cu.upload_id = u.id)
           AND NOT EXISTS (SELECT 1 FROM procedures p WHERE p.document_upload_id = u.id)
         ORDER BY u.created_at
         LIMIT $2
           FOR UPDATE SKIP LOCKED)
      RETURNING d.id, d.organization_id AS "organizationId", d.storage_key AS "storageKey",
                d.file_name AS "fileName", d.kind)
     SELECT * FROM gone`,
    [before, limit],
  );
}
