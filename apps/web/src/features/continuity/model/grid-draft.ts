// The continuity-log grid being edited, as plain data: built from the API's grid, changed by pure
// functions (toggle, type, fill down, add a welder), compared with what was saved (dirty) and turned into
// the one PUT body of the month. The screen, the component tests and the request all use these.
import { processes as allProcesses, type Grid, type GridSaveBody, type GridWelder } from '@beadroll/rules';

export interface CellValue {
  used: boolean;
  jobReference: string;
  note: string;
  usedOn: string;
}

export interface DraftCell extends CellValue {
  /** False when the welder holds no qualification for the process: nothing can be logged there. */
  enabled: boolean;
  flaggedLapsed: boolean;
  /** What the server holds for the cell (null: nothing logged). */
  saved: CellValue | null;
  /** The server's version of the cell the edit started from (null: it was empty); sent with the save. */
  version: number | null;
}

export interface DraftRow {
  welder: { id: string; stamp: string; name: string };
  home: boolean;
  cells: Record<string, DraftCell>;
}

export interface GridDraft {
  shopId: string;
  month: string;
  closed: boolean;
  processes: string[];
  rows: DraftRow[];
}

export const cellKey = (welderId: string, process: string) => `${welderId}:${process}`;
export const firstDayOf = (month: string) => `${month}-01`;

function emptyCell(month: string, enabled: boolean): DraftCell {
  return { used: false, jobReference: '', note: '', usedOn: firstDayOf(month), enabled, flaggedLapsed: false, saved: null, version: null };
}

export function draftFromGrid(grid: Grid): GridDraft {
  return {
    shopId: grid.shop.id,
    month: grid.month,
    closed: grid.closed,
    processes: grid.processes,
    rows: grid.rows.map((row) => ({
      welder: { id: row.welder.id, stamp: row.welder.stamp, name: row.welder.name },
      home: row.home,
      cells: Object.fromEntries(
        grid.processes.map((p) => {
          const entry = row.cells[p] ?? null;
          const enabled = row.qualifiedProcesses.includes(p) || entry !== null;
          if (!entry) return [p, emptyCell(grid.month, enabled)];
          const value = { used: true, jobReference: entry.jobReference, note: entry.note, usedOn: entry.usedOn };
          return [p, { ...value, enabled, flaggedLapsed: entry.flaggedLapsed, saved: value, version: entry.version }];
        }),
      ),
    })),
  };
}

function mapCell(draft: GridDraft, welderId: string, process: string, change: (cell: DraftCell) => DraftCell): GridDraft {
  return {
    ...draft,
    rows: draft.rows.map((row) => {
      const cell = row.cells[process];
      if (row.welder.id !== welderId || !cell || !cell.enabled) return row;
      return { ...row, cells: { ...row.cells, [process]: change(cell) } };
    }),
  };
}

/** Changes one cell. Typing a job reference into an unused cell marks it used. */
export function setCell(draft: GridDraft, welderId: string, process: string, patch: Partial<CellValue>): GridDraft {
  return mapCell(draft, welderId, process, (cell) => {
    const next = { ...cell, ...patch };
    if (patch.jobReference !== undefined && patch.used === undefined && patch.jobReference.trim() && !cell.used) next.used = true;
    return next;
  });
}

export function toggleUsed(draft: GridDraft, welderId: string, process: string): GridDraft {
  return mapCell(draft, welderId, process, (cell) => ({ ...cell, used: !cell.used }));
}

/** The job reference fill-down would copy: the first one typed in the column, top to bottom. */
export function fillSource(draft: GridDraft, process: string): string | null {
  for (const row of draft.rows) {
    const cell = row.cells[process];
    if (cell?.enabled && cell.jobReference.trim()) return cell.jobReference.trim();
  }
  return null;
}

export type FillScope = 'all' | 'checked' | 'unchecked';

/**
 * Fill down: the column's job reference (or `jobReference` when given) goes into every chosen row that
 * can log the process — all of them, only the ticked ones or only the unticked ones — and marks them used.
 */
export function fillDown(draft: GridDraft, process: string, scope: FillScope = 'all', jobReference?: string): GridDraft {
  const job = (jobReference ?? fillSource(draft, process) ?? '').trim();
  if (!job) return draft;
  return {
    ...draft,
    rows: draft.rows.map((row) => {
      const cell = row.cells[process];
      if (!cell?.enabled) return row;
      if (scope === 'checked' && !cell.used) return row;
      if (scope === 'unchecked' && cell.used) return row;
      return { ...row, cells: { ...row.cells, [process]: { ...cell, used: true, jobReference: job } } };
    }),
  };
}

/** Adds a welder of another shop (found by stamp or name) as a row; new processes become columns. */
export function addWelder(draft: GridDraft, welder: GridWelder): GridDraft {
  if (draft.rows.some((r) => r.welder.id === welder.id)) return draft;
  const wanted = new Set([...draft.processes, ...welder.qualifiedProcesses]);
  const processes = (allProcesses as readonly string[]).filter((p) => wanted.has(p));
  const widen = (row: DraftRow): DraftRow => ({
    ...row,
    cells: Object.fromEntries(processes.map((p) => [p, row.cells[p] ?? emptyCell(draft.month, false)])),
  });
  const added: DraftRow = {
    welder: { id: welder.id, stamp: welder.stamp, name: welder.name },
    home: false,
    cells: Object.fromEntries(processes.map((p) => [p, emptyCell(draft.month, welder.qualifiedProcesses.includes(p))])),
  };
  return { ...draft, processes, rows: [...draft.rows.map(widen), added] };
}

function sameValue(a: CellValue, b: CellValue): boolean {
  return a.jobReference.trim() === b.jobReference.trim() && a.note.trim() === b.note.trim() && a.usedOn === b.usedOn;
}

function cellChanged(cell: DraftCell): boolean {
  if (!cell.saved) return cell.used;
  if (!cell.used) return true;
  return !sameValue(cell, cell.saved);
}

export function changedCells(draft: GridDraft): { welderId: string; process: string; cell: DraftCell }[] {
  return draft.rows.flatMap((row) =>
    draft.processes
      .map((process) => ({ welderId: row.welder.id, process, cell: row.cells[process] }))
      .filter((c): c is { welderId: string; process: string; cell: DraftCell } => Boolean(c.cell?.enabled && cellChanged(c.cell))),
  );
}

export function isDirty(draft: GridDraft): boolean {
  return changedCells(draft).length > 0;
}

/** The PUT /api/continuity/grid body: changed used cells are saved, cells unticked since saving removed. */
export function saveBody(draft: GridDraft): GridSaveBody & { cells: NonNullable<GridSaveBody['cells']>; remove: NonNullable<GridSaveBody['remove']> } {
  const changes = changedCells(draft);
  const cells = changes
    .filter((c) => c.cell.used)
    .map((c) => ({
      welderId: c.welderId,
      process: c.process as (typeof allProcesses)[number],
      usedOn: c.cell.usedOn,
      jobReference: c.cell.jobReference.trim(),
      note: c.cell.note.trim(),
      version: c.cell.version,
    }));
  const remove = changes
    .filter((c) => !c.cell.used)
    .map((c) => ({ welderId: c.welderId, process: c.process as (typeof allProcesses)[number], version: c.cell.version }));
  return { shopId: draft.shopId, month: draft.month, cells, remove };
}

/** A 400's `cells.3.jobReference` keys, turned back into the cell they are about and the field named. */
export function cellErrors(
  body: ReturnType<typeof saveBody>,
  fields: Readonly<Record<string, string>>,
): { byCell: Record<string, Partial<Record<keyof CellValue | 'process', string>>>; other: string[] } {
  const byCell: Record<string, Partial<Record<keyof CellValue | 'process', string>>> = {};
  const other: string[] = [];
  for (const [path, message] of Object.entries(fields)) {
    const m = /^(cells|remove)\.(\d+)(?:\.(\w+))?$/.exec(path);
    const list = m?.[1] === 'remove' ? body.remove : body.cells;
    const target = m ? list[Number(m[2])] : undefined;
    if (!m || !target) {
      other.push(message);
      continue;
    }
    const key = cellKey(target.welderId, target.process);
    const field = (m[3] === 'welderId' ? 'process' : (m[3] ?? 'process')) as keyof CellValue | 'process';
    byCell[key] = { ...byCell[key], [field]: message };
  }
  return { byCell, other };
}
