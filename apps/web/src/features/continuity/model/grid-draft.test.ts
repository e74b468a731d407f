import type { Grid } from '@beadroll/rules';
import { describe, expect, it } from 'vitest';
import { addWelder, cellErrors, draftFromGrid, fillDown, fillSource, isDirty, saveBody, setCell, toggleUsed } from './grid-draft';

const ids = ['11111111-1111-4111-8111-111111111111', '22222222-2222-4222-8222-222222222222', '33333333-3333-4333-8333-333333333333'];
const shopId = '44444444-4444-4444-8444-444444444444';

const grid: Grid = {
  shop: { id: shopId, name: 'Vessel Bay', code: 'PV' },
  month: '2026-11',
  closed: false,
  processes: ['SMAW', 'GTAW'],
  rows: [
    { welder: { id: ids[0]!, stamp: 'PV-01', name: 'A', homeShopId: shopId }, home: true, qualifiedProcesses: ['SMAW', 'GTAW'], pairs: [], cells: { SMAW: null, GTAW: null } },
    {
      welder: { id: ids[1]!, stamp: 'PV-02', name: 'B', homeShopId: shopId },
      home: true,
      qualifiedProcesses: ['SMAW'],
      pairs: [],
      cells: { SMAW: { entryId: 'e1', usedOn: '2026-11-03', jobReference: 'J-9', note: '', flaggedLapsed: true, version: 1 }, GTAW: null },
    },
    { welder: { id: ids[2]!, stamp: 'PV-03', name: 'C', homeShopId: shopId }, home: true, qualifiedProcesses: ['SMAW'], pairs: [], cells: { SMAW: null, GTAW: null } },
  ],
};

describe('the continuity-log grid draft', () => {
  it('starts clean, prefills the first day of the month and marks saved and flagged cells', () => {
    const draft = draftFromGrid(grid);
    expect(isDirty(draft)).toBe(false);
    expect(draft.rows[0]!.cells.SMAW).toMatchObject({ used: false, usedOn: '2026-11-01', enabled: true });
    expect(draft.rows[1]!.cells.SMAW).toMatchObject({ used: true, jobReference: 'J-9', flaggedLapsed: true });
    expect(draft.rows[1]!.cells.GTAW!.enabled).toBe(false);
    expect(saveBody(draft)).toEqual({ shopId, month: '2026-11', cells: [], remove: [] });
  });

  it('is dirty after a change and clean again when the change is undone', () => {
    const draft = draftFromGrid(grid);
    const ticked = toggleUsed(draft, ids[0]!, 'SMAW');
    expect(isDirty(ticked)).toBe(true);
    expect(isDirty(toggleUsed(ticked, ids[0]!, 'SMAW'))).toBe(false);
    const retyped = setCell(draft, ids[1]!, 'SMAW', { jobReference: 'J-10' });
    expect(isDirty(retyped)).toBe(true);
    expect(isDirty(setCell(retyped, ids[1]!, 'SMAW', { jobReference: 'J-9 ' }))).toBe(false);
  });

  it('typing a job marks the cell used; a cell without a qualification cannot change', () => {
    const draft = setCell(draftFromGrid(grid), ids[0]!, 'GTAW', { jobReference: 'T-1' });
    expect(draft.rows[0]!.cells.GTAW).toMatchObject({ used: true, jobReference: 'T-1' });
    const blocked = setCell(draft, ids[1]!, 'GTAW', { jobReference: 'T-1' });
    expect(blocked.rows[1]!.cells.GTAW).toMatchObject({ used: false, jobReference: '' });
  });

  it('fills a job down the column into every row that can log it and marks them used', () => {
    const typed = setCell(draftFromGrid(grid), ids[0]!, 'SMAW', { jobReference: 'TRAV-4471' });
    expect(fillSource(typed, 'SMAW')).toBe('TRAV-4471');
    const filled = fillDown(typed, 'SMAW');
    expect(filled.rows.map((r) => [r.cells.SMAW!.used, r.cells.SMAW!.jobReference])).toEqual([
      [true, 'TRAV-4471'],
      [true, 'TRAV-4471'],
      [true, 'TRAV-4471'],
    ]);
    // GTAW: only the one welder qualified for it; the others stay untouched.
    const gtaw = fillDown(filled, 'GTAW', 'all', 'T-2');
    expect(gtaw.rows.map((r) => r.cells.GTAW!.used)).toEqual([true, false, false]);
    const body = saveBody(gtaw);
    expect(body.cells).toHaveLength(4);
    expect(body.cells.find((c) => c.welderId === ids[1])).toMatchObject({ process: 'SMAW', jobReference: 'TRAV-4471', usedOn: '2026-11-03' });
  });

  it('fills only the unticked rows when asked, keeping the jobs already logged', () => {
    const typed = setCell(draftFromGrid(grid), ids[0]!, 'SMAW', { jobReference: 'TRAV-1' });
    const filled = fillDown(typed, 'SMAW', 'unchecked');
    expect(filled.rows.map((r) => r.cells.SMAW!.jobReference)).toEqual(['TRAV-1', 'J-9', 'TRAV-1']);
    expect(fillDown(draftFromGrid(grid), 'GTAW')).toEqual(draftFromGrid(grid)); // nothing typed: nothing to copy
  });

  it('sends an unticked saved cell as a removal, and maps 400 fields back to their cells', () => {
    const draft = toggleUsed(setCell(draftFromGrid(grid), ids[0]!, 'SMAW', { jobReference: 'X' }), ids[1]!, 'SMAW');
    const body = saveBody(draft);
    expect(body.remove).toEqual([{ welderId: ids[1], process: 'SMAW', version: 1 }]);
    const mapped = cellErrors(body, { 'cells.0.usedOn': 'The date must be within 2026-11', month: 'The month cannot be in the future' });
    expect(mapped.byCell[`${ids[0]}:SMAW`]).toEqual({ usedOn: 'The date must be within 2026-11' });
    expect(mapped.other).toEqual(['The month cannot be in the future']);
  });

  it('adds a welder of another shop as a row, with new processes as columns in the usual order', () => {
    const draft = addWelder(draftFromGrid(grid), {
      id: '55555555-5555-4555-8555-555555555555',
      stamp: 'ST-09',
      name: 'D',
      homeShop: { id: 'x', name: 'Structural', code: 'ST' },
      qualifiedProcesses: ['GMAW', 'SMAW'],
    });
    expect(draft.processes).toEqual(['SMAW', 'GTAW', 'GMAW']);
    expect(draft.rows[3]!.cells.GMAW!.enabled).toBe(true);
    expect(draft.rows[3]!.cells.GTAW!.enabled).toBe(false);
    expect(draft.rows[0]!.cells.GMAW!.enabled).toBe(false);
    expect(isDirty(draft)).toBe(false);
  });
});
