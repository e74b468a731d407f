// The continuity-log grid being edited, as plain data: built from the API's grid, changed by pure
// functions (toggle, type, fill down, add a welder), compared with what was saved (dirty) and turned into
// the one PUT body of the month. The screen, the component tests and the request all use these.
import { codeNames } from '@/lib/codes';
import { daysBetween, processes as allProcesses, type CodeId, type Grid, type GridPair, type GridSaveBody, type GridWelder } from '@beadroll/rules';

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
  /** The user unticked this cell: fill-down never ticks it again. */
  unticked: boolean;
}

export interface DraftRow {
  welder: { id: string; stamp: string; name: string };
  home: boolean;
  /** The row's (process, code) pairs with their lapse and revocation dates (the cell states). */
  pairs: GridPair[];
  cells: Record<string, DraftCell>;
}

export interface GridDraft {
  shopId: string;
  month: string;
  closed: boolean;
  /** The company's today, from the server (the day the states count from). */
  today: string;
  /** The last day of use the user entered in this grid: offered for the next tick (never a made-up date). */
  lastDate: string;
  processes: string[];
  rows: DraftRow[];
}

export const cellKey = (welderId: string, process: string) => `${welderId}:${process}`;

// A new cell has no day of use: the user gives one (or the grid offers the last one they entered). A
// month-start default would record use on a day the welder may not have worked (issue 8 defect 3).
function emptyCell(enabled: boolean): DraftCell {
  return { used: false, jobReference: '', note: '', usedOn: '', enabled, flaggedLapsed: false, saved: null, version: null, unticked: false };
}

export function draftFromGrid(grid: Grid): GridDraft {
  return {
    shopId: grid.shop.id,
    month: grid.month,
    closed: grid.closed,
    today: grid.today ?? new Date().toISOString().slice(0, 10),
    lastDate: '',
    processes: grid.processes,
    rows: grid.rows.map((row) => ({
      welder: { id: row.welder.id, stamp: row.welder.stamp, name: row.welder.name },
      home: row.home,
      pairs: row.pairs,
      cells: Object.fromEntries(
        grid.processes.map((p) => {
          const entry = row.cells[p] ?? null;
          const enabled = row.qualifiedProcesses.includes(p) || entry !== null;
          if (!entry) return [p, emptyCell(enabled)];
          const value = { used: true, jobReference: entry.jobReference, note: entry.note, usedOn: entry.usedOn };
          return [p, { ...value, enabled, flaggedLapsed: entry.flaggedLapsed, saved: value, version: entry.version, unticked: false }];
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

/** Changes one cell. Typing a job reference into an unused cell marks it used; ticking offers the last day entered. */
export function setCell(draft: GridDraft, welderId: string, process: string, patch: Partial<CellValue>): GridDraft {
  const next = mapCell(draft, welderId, process, (cell) => {
    const c = { ...cell, ...patch };
    if (patch.jobReference !== undefined && patch.used === undefined && patch.jobReference.trim() && !cell.used) c.used = true;
    if (c.used && !cell.used && !c.usedOn) c.usedOn = draft.lastDate;
    if (patch.used === false && cell.used) c.unticked = true;
    if (patch.used === true) c.unticked = false;
    return c;
  });
  return patch.usedOn ? { ...next, lastDate: patch.usedOn } : next;
}

export function toggleUsed(draft: GridDraft, welderId: string, process: string): GridDraft {
  const cell = draft.rows.find((r) => r.welder.id === welderId)?.cells[process];
  return cell ? setCell(draft, welderId, process, { used: !cell.used }) : draft;
}

/** The job reference fill-down would copy: the first one typed in the column, top to bottom. */
export function fillSource(draft: GridDraft, process: string): string | null {
  for (const row of draft.rows) {
    const cell = row.cells[process];
    if (cell?.enabled && cell.jobReference.trim()) return cell.jobReference.trim();
  }
  return null;
}

/** 'empty': only cells with nothing in them (the default); 'all': also overwrite other jobs (asked for). */
export type FillScope = 'empty' | 'all';

/**
 * Fill down: the column's job reference (or `jobReference` when given) goes into the rows that can log
 * the process and marks them used — by default only empty cells, with `'all'` also over other jobs. A
 * cell the user unticked is never ticked again. The day of use is `usedOn` when the user gave one for the
 * fill, else the cell's own; fill-down never makes a date up (an undated cell must be dated before saving).
 */
export function fillDown(
  draft: GridDraft,
  process: string,
  scope: FillScope = 'empty',
  jobReference?: string,
  usedOn?: string,
): GridDraft {
  const job = (jobReference ?? fillSource(draft, process) ?? '').trim();
  if (!job) return draft;
  const next = {
    ...draft,
    rows: draft.rows.map((row) => {
      const cell = row.cells[process];
      if (!cell?.enabled || cell.unticked) return row;
      const empty = !cell.used && !cell.jobReference.trim();
      if (scope === 'empty' && !empty) return row;
      const day = usedOn || cell.usedOn;
      return { ...row, cells: { ...row.cells, [process]: { ...cell, used: true, jobReference: job, usedOn: day } } };
    }),
  };
  return usedOn ? { ...next, lastDate: usedOn } : next;
}

export type CellStateKind = 'current' | 'lapsing' | 'lapsed' | 'revoked';
export interface CodeState {
  code: string;
  label: string;
  kind: CellStateKind;
  lapsesOn: string;
  daysLeft: number;
  revokedOn: string | null;
}

/**
 * The state of each code's qualification of a cell's process as of a day (default the company's today):
 * revoked from its revocation, lapsed from its lapse date, lapsing within `warnDays`.
 */
export function cellStates(row: DraftRow, process: string, asOf: string, warnDays = 30): CodeState[] {
  return row.pairs
    .filter((p) => p.process === process)
    .map((p) => {
      const daysLeft = daysBetween(asOf, p.lapsesOn);
      const kind: CellStateKind =
        p.revokedOn && p.revokedOn <= asOf ? 'revoked' : daysLeft <= 0 ? 'lapsed' : daysLeft <= warnDays ? 'lapsing' : 'current';
      return { code: p.code, label: codeNames[p.code as CodeId] ?? p.code, kind, lapsesOn: p.lapsesOn, daysLeft, revokedOn: p.revokedOn };
    });
}

/**
 * Changed, ticked cells whose day of use falls on or after a lapse or revocation of one of the process's
 * qualifications: such use counts for nothing and is flagged for the QA manager, so the screen asks first.
 */
export function usesAfterLapse(draft: GridDraft): { welderId: string; stamp: string; process: string; usedOn: string; codes: CodeState[] }[] {
  return changedCells(draft).flatMap(({ welderId, process, cell }) => {
    if (!cell.used || !cell.usedOn) return [];
    const row = draft.rows.find((r) => r.welder.id === welderId);
    if (!row) return [];
    // A saved cell that already counted moved the lapse date past itself: judge it by the state without it.
    const codes = cellStates(row, process, cell.usedOn).filter((c) => c.kind === 'lapsed' || c.kind === 'revoked');
    return codes.length ? [{ welderId, stamp: row.welder.stamp, process, usedOn: cell.usedOn, codes }] : [];
  });
}

/** Ticked changed cells without a day of use: the save asks for one instead of inventing it. */
export function undatedCells(draft: GridDraft): string[] {
  return changedCells(draft)
    .filter((c) => c.cell.used && !c.cell.usedOn)
    .map((c) => cellKey(c.welderId, c.process));
}

/**
 * After a 409: the fresh grid from the server with the user's own edits laid over it, so nothing typed
 * is lost. Each edited cell now carries the server's current version: saving again reapplies the edit
 * over the other person's change; `takeTheirs` drops the edit of one cell instead.
 */
export function rebaseDraft(fresh: GridDraft, mine: GridDraft): GridDraft {
  const edits = new Map(changedCells(mine).map((c) => [cellKey(c.welderId, c.process), c.cell]));
  const known = new Set(fresh.rows.map((r) => r.welder.id));
  const added = mine.rows.filter((r) => !known.has(r.welder.id));
  const processes = (allProcesses as readonly string[]).filter((p) => fresh.processes.includes(p) || mine.processes.includes(p));
  const rows = [...fresh.rows, ...added].map((row) => ({
    ...row,
    cells: Object.fromEntries(
      processes.map((p) => {
        const base = row.cells[p] ?? emptyCell(false);
        const edit = edits.get(cellKey(row.welder.id, p));
        if (!edit || !base.enabled) return [p, base];
        const value = { used: edit.used, jobReference: edit.jobReference, note: edit.note, usedOn: edit.usedOn };
        return [p, { ...base, ...value, unticked: edit.unticked }];
      }),
    ),
  }));
  return { ...fresh, processes, rows, lastDate: mine.lastDate };
}

export function takeTheirs(draft: GridDraft, welderId: string, process: string): GridDraft {
  return mapCell(draft, welderId, process, (cell) =>
    cell.saved ? { ...cell, ...cell.saved, unticked: false } : { ...cell, used: false, jobReference: '', note: '', usedOn: '', unticked: false },
  );
}

/** Adds a welder of another shop (found by stamp or name) as a row; new processes become columns. */
export function addWelder(draft: GridDraft, welder: GridWelder): GridDraft {
  if (draft.rows.some((r) => r.welder.id === welder.id)) return draft;
  const wanted = new Set([...draft.processes, ...welder.qualifiedProcesses]);
  const processes = (allProcesses as readonly string[]).filter((p) => wanted.has(p));
  const widen = (row: DraftRow): DraftRow => ({
    ...row,
    cells: Object.fromEntries(processes.map((p) => [p, row.cells[p] ?? emptyCell(false)])),
  });
  const added: DraftRow = {
    welder: { id: welder.id, stamp: welder.stamp, name: welder.name },
    home: false,
    pairs: [],
    cells: Object.fromEntries(processes.map((p) => [p, emptyCell(welder.qualifiedProcesses.includes(p))])),
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
