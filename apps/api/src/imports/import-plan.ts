// What every kind of import shares: reading a mapped field of a row, collecting problems per row and
// column, and the plan a dry run produces (its report, and how to write it).
import type { EntityManager } from 'typeorm';
import type { z } from 'zod';
import type { ImportDateFormat, ImportField, ImportMapping, ImportReport } from '@beadroll/rules';
import type { Actor } from '../lib/scope.js';
import type { Clock } from '../lib/context.js';
import type { Sheet, SheetRow } from './spreadsheet.js';

export const MAX_ISSUES = 500;
export const MAX_CHANGES = 200;

export type FieldDef = ImportField & { aliases: string[] };

export interface PlanContext {
  db: EntityManager;
  actor: Actor;
  /** The import being checked or committed (rows it writes may name it). */
  importId: string;
  sheet: Sheet;
  mapping: ImportMapping;
  dateFormat: ImportDateFormat;
  /** Today in the company's calendar (ISO day). */
  today: string;
  /** The clock lapse notices are dated by. */
  clock: Clock;
}

/** Called between batches while writing: reports progress and throws if the import was cancelled. */
export type Tick = (phase: string, done: number, total: number) => Promise<void>;

export interface ImportPlan {
  report: ImportReport;
  /** Writes the planned changes in the caller's transaction; returns counts for the audit record. */
  apply(db: EntityManager, tick: Tick): Promise<Record<string, number>>;
}

export interface KindDef {
  fields: FieldDef[];
  plan(ctx: PlanContext): Promise<ImportPlan>;
}

/** Problems and counts of one dry run. */
export class Findings {
  readonly issues: ImportReport['issues'] = [];
  readonly changes: ImportReport['changes'] = [];
  readonly notes: string[] = [];
  private badRows = new Set<number>();
  counts = { new: 0, unchanged: 0, changed: 0 };

  add(line: number, column: string | null, message: string) {
    this.badRows.add(line);
    if (this.issues.length < MAX_ISSUES) this.issues.push({ row: line, column, message });
  }
  has(line: number) {
    return this.badRows.has(line);
  }
  change(line: number, key: string, before: Record<string, string>, after: Record<string, string>) {
    this.counts.changed++;
    if (this.changes.length < MAX_CHANGES) this.changes.push({ row: line, key, before, after });
  }
  report(rows: number): ImportReport {
    return {
      rows,
      ...this.counts,
      errors: this.badRows.size,
      issues: [...this.issues].sort((a, b) => a.row - b.row),
      changes: this.changes,
      notes: this.notes,
    };
  }
}

/** Reads mapped fields from rows; checks required fields are mapped. */
export class Columns {
  private index = new Map<string, number>();
  constructor(
    private readonly fields: FieldDef[],
    private readonly ctx: PlanContext,
  ) {
    for (const f of fields) {
      const header = ctx.mapping[f.key];
      const i = header ? ctx.sheet.headers.indexOf(header) : -1;
      if (i >= 0) this.index.set(f.key, i);
    }
  }
  /** Required fields without a column: each names itself (the import cannot run without them). */
  missing(): string[] {
    return this.fields.filter((f) => f.required && !this.index.has(f.key)).map((f) => f.label);
  }
  has(key: string) {
    return this.index.has(key);
  }
  get(row: SheetRow, key: string): string {
    const i = this.index.get(key);
    return i === undefined ? '' : (row.cells[i] ?? '');
  }
  header(key: string): string | null {
    return this.ctx.mapping[key] ?? null;
  }
}

/** Each zod issue as a problem in the column of the field it names (fieldOf maps schema keys to ours). */
export function addZodIssues(
  findings: Findings,
  cols: Columns,
  line: number,
  error: z.ZodError,
  fieldOf: Record<string, string> = {},
) {
  for (const issue of error.issues) {
    const key = String(issue.path[0] ?? '');
    findings.add(line, cols.header(fieldOf[key] ?? key), issue.message);
  }
}

/** Splits an array into batches of at most n. */
export function batches<T>(items: T[], n: number): T[][] {
  const out: T[][] = [];
  for (let i = 0; i < items.length; i += n) out.push(items.slice(i, i + n));
  return out;
}

/** Lets other requests (and the database pool's timers) run between slices of a long loop over rows. */
export const breathe = () => new Promise<void>((resolve) => setImmediate(resolve));

export interface ShopRef {
  id: string;
  code: string;
}

/** The company's shops, found by code or by name as a spreadsheet writes them (any case). */
export async function shopsByCodeOrName(db: EntityManager, organizationId: string): Promise<Map<string, ShopRef>> {
  const shops = await db.query<{ id: string; code: string; name: string }[]>(
    `SELECT id, code, name FROM shops WHERE organization_id = $1`,
    [organizationId],
  );
  const byKey = new Map<string, ShopRef>();
  for (const s of shops) {
    const ref = { id: s.id, code: s.code };
    byKey.set(s.code.toLowerCase(), ref);
    byKey.set(s.name.toLowerCase(), ref);
  }
  return byKey;
}

/** The company's welders by stamp, with their home shop (the default shop of a row). */
export async function weldersByStamp(db: EntityManager, organizationId: string) {
  const rows = await db.query<{ id: string; stamp: string; homeShopId: string }[]>(
    `SELECT id, stamp, home_shop_id AS "homeShopId" FROM welders WHERE organization_id = $1`,
    [organizationId],
  );
  return new Map(rows.map((w) => [w.stamp, w]));
}
