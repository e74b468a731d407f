// Imports of spreadsheets (QA manager): upload (the file is checked to be a spreadsheet and kept in the
// object store), map columns and check (the dry run: every row validated, counts of new / unchanged /
// changed, nothing written), then commit — all or nothing in one transaction, audited as one import,
// with progress and a cancel. The commit plans again inside its transaction, so what it writes is what
// the data says at that moment; re-importing the same file finds every row unchanged.
import { randomUUID } from 'node:crypto';
import type { Readable } from 'node:stream';
import type { Import, ImportCheckInput, ImportKind } from '@beadroll/rules';
import type { AppDeps } from '../lib/context.js';
import { AppError } from '../lib/errors.js';
import { recordAudit } from '../lib/audit.js';
import { isUuid, type Actor } from '../lib/scope.js';
import { suggestMapping } from './cells.js';
import type { KindDef, PlanContext } from './import-plan.js';
import { readSpreadsheet, MAX_IMPORT_BYTES, SNIFF_BYTES, sniff, type FileType } from './spreadsheet.js';
import { readHead, streamToStore } from '../lib/stream-to-store.js';
import { weldersImport } from './welders.import.js';
import { continuityImport } from './continuity.import.js';
import { qualificationsImport } from './qualifications.import.js';
import * as repo from './imports.repository.js';
import { companyToday } from '../settings/settings.repository.js';

export const importTooLarge = () => new AppError('payload_too_large', 'The file is larger than 20 MB; split it');

const kinds: Partial<Record<ImportKind, KindDef>> = { welders: weldersImport, qualifications: qualificationsImport, continuity: continuityImport };

function kindDef(kind: ImportKind): KindDef {
  const def = kinds[kind];
  if (!def) throw AppError.validation({ kind: `Importing ${kind} is not available yet` });
  return def;
}

function view(row: repo.ImportRow): Import {
  const def = kinds[row.kind];
  return {
    id: row.id,
    kind: row.kind,
    fileName: row.fileName,
    fileType: row.fileType,
    sizeBytes: row.sizeBytes,
    status: row.status,
    headers: row.options.headers,
    fields: (def?.fields ?? []).map(({ aliases: _a, ...f }) => f),
    mapping: row.options.mapping,
    dateFormat: row.options.dateFormat,
    report: row.summary,
    progress: { phase: row.phase, done: row.processedRows, total: row.totalRows },
    error: row.error,
    createdAt: row.createdAt.toISOString(),
    finishedAt: row.finishedAt ? row.finishedAt.toISOString() : null,
    createdBy: row.createdBy,
  };
}

async function load(deps: AppDeps, actor: Actor, id: string): Promise<repo.ImportRow> {
  const row = isUuid(id) ? await repo.findImport(deps.dataSource.manager, actor.organizationId, id) : null;
  if (!row) throw AppError.notFound('import');
  return row;
}

export async function getImport(deps: AppDeps, actor: Actor, id: string): Promise<Import> {
  return view(await load(deps, actor, id));
}

export async function listImports(deps: AppDeps, actor: Actor) {
  const rows = await repo.listImports(deps.dataSource.manager, actor.organizationId);
  return { items: rows.map((r) => { const { report: _r, fields: _f, headers: _h, ...rest } = view(r); return rest; }) };
}

const contentTypes: Record<FileType, string> = {
  csv: 'text/csv',
  xlsx: 'application/vnd.openxmlformats-officedocument.spreadsheetml.sheet',
};

/** An import file in the object store (receiveImportFile), not yet described by a row. */
export interface StoredImportFile {
  id: string;
  objectKey: string;
  type: FileType;
  fileName: string;
  size: number;
  sha256: string;
}

/**
 * Streams an arriving spreadsheet into the object store as it comes (never held whole in memory while it
 * arrives): what it is is told from its first 64 KB (anything else is refused before a byte is stored)
 * and the 20 MB cap is enforced while the bytes flow; a refused, oversize or broken-off file leaves
 * nothing in the store.
 */
export async function receiveImportFile(
  deps: AppDeps,
  actor: Actor,
  file: { stream: Readable; originalname: string },
): Promise<StoredImportFile> {
  const arriving = await readHead(file.stream, SNIFF_BYTES);
  let type: FileType;
  try {
    type = sniff(arriving.head);
  } catch (err) {
    file.stream.resume();
    throw err;
  }
  const id = randomUUID();
  const objectKey = `imports/${actor.organizationId}/${id}.${type}`;
  const { size, sha256 } = await streamToStore(deps, {
    stream: file.stream,
    file: arriving,
    key: objectKey,
    contentType: contentTypes[type],
    maxBytes: MAX_IMPORT_BYTES,
    tooLarge: importTooLarge,
  });
  return { id, objectKey, type, fileName: file.originalname, size, sha256 };
}

/** Reads the stored file, describes it by a row; the object is deleted when either cannot be done. */
export async function uploadImport(
  deps: AppDeps,
  actor: Actor,
  kind: ImportKind,
  file: StoredImportFile | undefined,
): Promise<Import> {
  if (!file) throw AppError.validation({ file: 'Choose a .csv or .xlsx file' });
  try {
    const def = kindDef(kind);
    const { body } = await deps.storage.get(file.objectKey);
    const { sheet } = await readSpreadsheet(body);
    const saved = await repo.savedMapping(deps.dataSource.manager, actor.organizationId, kind);
    await repo.insertImport(deps.dataSource.manager, {
      id: file.id,
      organizationId: actor.organizationId,
      kind,
      fileName: file.fileName.slice(0, 200) || `import.${file.type}`,
      fileType: file.type,
      sha256: file.sha256,
      sizeBytes: file.size,
      objectKey: file.objectKey,
      options: {
        headers: sheet.headers,
        mapping: suggestMapping(def.fields, sheet.headers, saved?.mapping ?? null),
        dateFormat: saved?.dateFormat ?? null,
      },
      totalRows: sheet.rows.length,
      createdBy: actor.id,
      at: deps.clock.now(),
    });
  } catch (err) {
    await deps.storage.delete(file.objectKey).catch((e: unknown) => deps.logger.error({ err: e }, 'could not delete a refused import file'));
    throw err;
  }
  return getImport(deps, actor, file.id);
}

async function readFile(deps: AppDeps, row: repo.ImportRow) {
  const { body } = await deps.storage.get(row.objectKey);
  return (await readSpreadsheet(body)).sheet;
}

function checkMapping(row: repo.ImportRow, input: ImportCheckInput) {
  const def = kindDef(row.kind);
  const known = new Set(def.fields.map((f) => f.key));
  const fields: Record<string, string> = {};
  const used = new Map<string, string>();
  for (const [key, header] of Object.entries(input.mapping)) {
    if (!known.has(key)) fields[`mapping.${key}`] = 'Not a field of this import';
    else if (header !== null && !row.options.headers.includes(header)) fields[`mapping.${key}`] = `The file has no column “${header}”`;
    else if (header !== null && used.has(header)) fields[`mapping.${key}`] = `Column “${header}” is already used for ${used.get(header)}`;
    if (header !== null) used.set(header, key);
  }
  if (Object.keys(fields).length) throw AppError.validation(fields, 'Check the column mapping');
}

const planContext = async (deps: AppDeps, actor: Actor, importId: string, db: PlanContext['db'], sheet: PlanContext['sheet'], input: ImportCheckInput): Promise<PlanContext> => ({
  db,
  actor,
  importId,
  sheet,
  mapping: input.mapping,
  dateFormat: input.dateFormat,
  // The company's own day: a date of use is "in the future" by its clock, not the server's.
  today: await companyToday(db, actor, deps.clock),
  clock: deps.clock,
});

/** The dry run: nothing is written but the report and the company's mapping for this kind. */
export async function checkImport(deps: AppDeps, actor: Actor, id: string, input: ImportCheckInput): Promise<Import> {
  const row = await load(deps, actor, id);
  if (row.status === 'running' || row.status === 'committed')
    throw AppError.conflict(row.status === 'running' ? 'This import is running' : 'This import is already committed');
  checkMapping(row, input);
  const sheet = await readFile(deps, row);
  const plan = await kindDef(row.kind).plan(await planContext(deps, actor, row.id, deps.dataSource.manager, sheet, input));
  const options = { headers: row.options.headers, mapping: input.mapping, dateFormat: input.dateFormat };
  await deps.dataSource.transaction(async (db) => {
    await repo.saveCheck(db, row.id, options, plan.report);
    await repo.saveMapping(db, actor.organizationId, row.kind, input.mapping, input.dateFormat);
  });
  return getImport(deps, actor, id);
}

class Cancelled extends Error {}

/** Starts the commit of a checked import without errors; the answer comes at once, progress by polling. */
export async function commitImport(deps: AppDeps, actor: Actor, id: string): Promise<{ done: Promise<void>; view: Import }> {
  const row = await load(deps, actor, id);
  if (row.status !== 'checked') throw AppError.conflict('Check the file (dry run) before committing it');
  if (!row.summary || row.summary.errors > 0)
    throw AppError.validation({ file: 'Fix the rows the check reported, then check again' }, 'The file still has problems');
  if (!(await repo.startRun(deps.dataSource.manager, actor.organizationId, id)))
    throw AppError.conflict('This import is already running or done');
  const done = runCommit(deps, actor, row).catch((err: unknown) => deps.logger.error({ err, importId: id }, 'import failed'));
  return { done, view: await getImport(deps, actor, id) };
}

async function runCommit(deps: AppDeps, actor: Actor, row: repo.ImportRow): Promise<void> {
  const progress = async (phase: string, done: number, total: number) => {
    if (await repo.reportProgress(deps.dataSource.manager, row.id, phase, done, total)) throw new Cancelled();
  };
  try {
    const sheet = await readFile(deps, row);
    await progress('checking', 0, sheet.rows.length);
    const input = { mapping: row.options.mapping, dateFormat: row.options.dateFormat ?? 'iso' };
    await deps.dataSource.transaction(async (db) => {
      await db.query(`SET LOCAL statement_timeout = '300s'`);
      // One import of a company at a time: two would plan against each other's unwritten rows.
      await db.query(`SELECT pg_advisory_xact_lock(hashtextextended('import:' || $1, 0))`, [actor.organizationId]);
      const plan = await kindDef(row.kind).plan(await planContext(deps, actor, row.id, db, sheet, input));
      if (plan.report.errors > 0) throw new AppError('conflict', 'The data changed since the check; check the file again');
      await progress('writing', 0, plan.report.new + plan.report.changed);
      const written = await plan.apply(db, progress);
      await progress('finishing', plan.report.new + plan.report.changed, plan.report.new + plan.report.changed);
      const at = deps.clock.now();
      await recordAudit(db, actor, at, {
        action: 'import.committed',
        entityType: 'import',
        entityId: row.id,
        before: null,
        after: {
          kind: row.kind,
          fileName: row.fileName,
          objectKey: row.objectKey,
          rows: plan.report.rows,
          new: plan.report.new,
          changed: plan.report.changed,
          unchanged: plan.report.unchanged,
          ...written,
        },
      });
      // The last word on a cancel: this row lock orders it against a cancel request. A cancel that came
      // first rolls everything back; one that comes after waits for this commit and is then refused.
      if (!(await repo.markCommitted(db, row.id, at, plan.report))) throw new Cancelled();
    });
  } catch (err) {
    const at = deps.clock.now();
    if (err instanceof Cancelled) await repo.finishRun(deps.dataSource.manager, row.id, 'cancelled', at, 'Cancelled; nothing was written');
    else {
      const message = err instanceof AppError ? err.message : 'The import failed on our side; nothing was written';
      await repo.finishRun(deps.dataSource.manager, row.id, 'failed', at, message);
      if (!(err instanceof AppError)) throw err;
    }
  }
}

export async function cancelImport(deps: AppDeps, actor: Actor, id: string): Promise<Import> {
  const row = await load(deps, actor, id);
  if (!(await repo.requestCancel(deps.dataSource.manager, actor.organizationId, row.id)))
    throw AppError.conflict('Only a running import can be cancelled');
  return getImport(deps, actor, id);
}
