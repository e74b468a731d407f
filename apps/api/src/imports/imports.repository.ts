// SQL of imports and of the company's saved column mappings.
import type { EntityManager } from 'typeorm';
import type { ImportDateFormat, ImportKind, ImportMapping, ImportReport } from '@beadroll/rules';

export interface ImportRow {
  id: string;
  organizationId: string;
  kind: ImportKind;
  fileName: string;
  fileType: 'csv' | 'xlsx';
  sizeBytes: number;
  objectKey: string;
  status: 'uploaded' | 'checked' | 'running' | 'committed' | 'failed' | 'cancelled';
  options: { headers: string[]; mapping: ImportMapping; dateFormat: ImportDateFormat | null };
  summary: ImportReport | null;
  phase: string;
  totalRows: number;
  processedRows: number;
  error: string | null;
  createdAt: Date;
  finishedAt: Date | null;
  createdBy: { id: string; name: string };
}

/** UPDATE … RETURNING: TypeORM's postgres driver answers [rows, affected count]. */
async function updateReturning<T>(db: EntityManager, sql: string, params: unknown[]): Promise<T[]> {
  const [rows] = await db.query<[T[], number]>(sql, params);
  return rows;
}

const select = `
  SELECT i.id, i.organization_id AS "organizationId", i.kind, i.file_name AS "fileName", i.file_type AS "fileType",
         i.size_bytes AS "sizeBytes", i.object_key AS "objectKey", i.status, i.options, i.summary, i.phase,
         i.total_rows AS "totalRows", i.processed_rows AS "processedRows", i.error, i.created_at AS "createdAt",
         i.finished_at AS "finishedAt", json_build_object('id', u.id, 'name', u.name) AS "createdBy"
    FROM imports i JOIN users u ON u.id = i.created_by`;

export async function findImport(db: EntityManager, organizationId: string, id: string): Promise<ImportRow | null> {
  const rows: ImportRow[] = await db.query(`${select} WHERE i.organization_id = $1 AND i.id = $2`, [organizationId, id]);
  return rows[0] ?? null;
}

export async function listImports(db: EntityManager, organizationId: string): Promise<ImportRow[]> {
  return db.query(`${select} WHERE i.organization_id = $1 ORDER BY i.created_at DESC LIMIT 50`, [organizationId]);
}

export async function insertImport(
  db: EntityManager,
  i: {
    id: string;
    organizationId: string;
    kind: ImportKind;
    fileName: string;
    fileType: 'csv' | 'xlsx';
    sha256: string;
    sizeBytes: number;
    objectKey: string;
    options: ImportRow['options'];
    totalRows: number;
    createdBy: string;
    at: Date;
  },
): Promise<void> {
  await db.query(
    `INSERT INTO imports (id, organization_id, kind, file_name, file_type, file_sha256, size_bytes, object_key, options,
                          total_rows, created_by, created_at)
     VALUES ($1, $2, $3, $4, $5, $6, $7, $8, $9, $10, $11, $12)`,
    [i.id, i.organizationId, i.kind, i.fileName, i.fileType, i.sha256, i.sizeBytes, i.objectKey, JSON.stringify(i.options), i.totalRows, i.createdBy, i.at],
  );
}

export async function saveCheck(
  db: EntityManager,
  id: string,
  options: ImportRow['options'],
  report: ImportReport,
): Promise<void> {
  await db.query(
    `UPDATE imports SET status = 'checked', options = $2, summary = $3, error = NULL, phase = '', processed_rows = 0,
            cancel_requested = false
      WHERE id = $1`,
    [id, JSON.stringify(options), JSON.stringify(report)],
  );
}

/** Moves a checked import to running; false when it was not (still) checked — e.g. a second click. */
export async function startRun(db: EntityManager, organizationId: string, id: string): Promise<boolean> {
  const rows = await updateReturning(
    db,
    `UPDATE imports SET status = 'running', phase = 'reading', processed_rows = 0, cancel_requested = false, error = NULL
      WHERE organization_id = $1 AND id = $2 AND status = 'checked' RETURNING id`,
    [organizationId, id],
  );
  return rows.length > 0;
}

/** Progress of a running import, written outside its transaction; answers whether a cancel was asked. */
export async function reportProgress(
  db: EntityManager,
  id: string,
  phase: string,
  done: number,
  total: number,
): Promise<boolean> {
  const [row] = await updateReturning<{ cancel: boolean }>(
    db,
    `UPDATE imports SET phase = $2, processed_rows = $3, total_rows = $4 WHERE id = $1 RETURNING cancel_requested AS cancel`,
    [id, phase, done, total],
  );
  return row?.cancel ?? false;
}

export async function finishRun(
  db: EntityManager,
  id: string,
  status: 'committed' | 'failed' | 'cancelled',
  at: Date,
  error: string | null,
): Promise<void> {
  await db.query(`UPDATE imports SET status = $2, finished_at = $3, error = $4, phase = '' WHERE id = $1`, [id, status, at, error]);
}

/** In the import's own transaction: committed, unless a cancel was asked (then false). */
export async function markCommitted(db: EntityManager, id: string, at: Date, report: ImportReport): Promise<boolean> {
  const rows = await updateReturning(
    db,
    `UPDATE imports SET status = 'committed', finished_at = $2, summary = $3, error = NULL, phase = ''
      WHERE id = $1 AND NOT cancel_requested RETURNING id`,
    [id, at, JSON.stringify(report)],
  );
  return rows.length > 0;
}

export async function requestCancel(db: EntityManager, organizationId: string, id: string): Promise<boolean> {
  const rows = await updateReturning(
    db,
    `UPDATE imports SET cancel_requested = true WHERE organization_id = $1 AND id = $2 AND status = 'running' RETURNING id`,
    [organizationId, id],
  );
  return rows.length > 0;
}

export async function savedMapping(
  db: EntityManager,
  organizationId: string,
  kind: ImportKind,
): Promise<{ mapping: ImportMapping; dateFormat: ImportDateFormat | null } | null> {
  const [row] = await db.query<{ mapping: ImportMapping; options: { dateFormat?: ImportDateFormat } }[]>(
    `SELECT mapping, options FROM import_mappings WHERE organization_id = $1 AND kind = $2`,
    [organizationId, kind],
  );
  return row ? { mapping: row.mapping, dateFormat: row.options.dateFormat ?? null } : null;
}

export async function saveMapping(
  db: EntityManager,
  organizationId: string,
  kind: ImportKind,
  mapping: ImportMapping,
  dateFormat: ImportDateFormat,
): Promise<void> {
  await db.query(
    `INSERT INTO import_mappings (organization_id, kind, mapping, options, updated_at) VALUES ($1, $2, $3, $4, now())
     ON CONFLICT (organization_id, kind) DO UPDATE SET mapping = EXCLUDED.mapping, options = EXCLUDED.options, updated_at = now()`,
    [organizationId, kind, JSON.stringify(mapping), JSON.stringify({ dateFormat })],
  );
}
