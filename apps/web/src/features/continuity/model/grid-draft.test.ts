import type { Grid } from '@beadroll/rules';
import { describe, expect, it } from 'vitest';
import { addWelder, cellErrors, cellStates, draftFromGrid, fillDown, fillSource, isDirty, rebaseDraft, saveBody, setCell, takeTheirs, toggleUsed, undatedCells, usesAfterLapse } from './grid-draft';

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
  it('starts clean, with no made-up day of use in empty cells, and marks saved and flagged cells', () => {
    const draft = draftFromGrid(grid);
    expect(isDirty(draft)).toBe(false);
    expect(draft.rows[0]!.cells.SMAW).toMatchObject({ used: false, usedOn: '', enabled: true });
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

  it('issue 8 defect 3: a tick is never dated the 1st by default; it takes the last day the user entered, or asks', () => {
    const ticked = toggleUsed(draftFromGrid(grid), ids[0]!, 'SMAW');
    expect(ticked.rows[0]!.cells.SMAW).toMatchObject({ used: true, usedOn: '' });
    expect(undatedCells(ticked)).toEqual([`${ids[0]}:SMAW`]);
    const dated = setCell(ticked, ids[0]!, 'SMAW', { usedOn: '2026-11-20' });
    expect(undatedCells(dated)).toEqual([]);
    const next = toggleUsed(dated, ids[2]!, 'SMAW');
    expect(next.rows[2]!.cells.SMAW!.usedOn).toBe('2026-11-20');
  });

  it('issue 10 item 5: fill job down fills only empty cells, keeps other jobs and never re-ticks an unticked cell', () => {
    let d = setCell(draftFromGrid(grid), ids[0]!, 'SMAW', { jobReference: 'TRAV-4471' });
    expect(fillSource(d, 'SMAW')).toBe('TRAV-4471');
    d = toggleUsed(d, ids[2]!, 'SMAW');
    d = toggleUsed(d, ids[2]!, 'SMAW'); // ticked then unticked by the user
    const filled = fillDown(d, 'SMAW');
    expect(filled.rows.map((r) => [r.cells.SMAW!.used, r.cells.SMAW!.jobReference])).toEqual([
      [true, 'TRAV-4471'],
      [true, 'J-9'],
      [false, ''],
    ]);
    // Asked to overwrite: other jobs change, the unticked cell still stays unticked.
    const all = fillDown(d, 'SMAW', 'all', 'TRAV-5');
    expect(all.rows.map((r) => [r.cells.SMAW!.used, r.cells.SMAW!.jobReference])).toEqual([
      [true, 'TRAV-5'],
      [true, 'TRAV-5'],
      [false, ''],
    ]);
    // The day comes from the user (the fill's day, or the cell's own), never made up.
    expect(all.rows[1]!.cells.SMAW!.usedOn).toBe('2026-11-03');
    expect(all.rows[0]!.cells.SMAW!.usedOn).toBe('');
    const withDay = fillDown(draftFromGrid(grid), 'SMAW', 'empty', 'TRAV-6', '2026-11-12');
    expect(withDay.rows.map((r) => r.cells.SMAW!.usedOn)).toEqual(['2026-11-12', '2026-11-03', '2026-11-12']);
    // GTAW: only the one welder qualified for it; the others stay untouched.
    const gtaw = fillDown(withDay, 'GTAW', 'empty', 'T-2', '2026-11-12');
    expect(gtaw.rows.map((r) => r.cells.GTAW!.used)).toEqual([true, false, false]);
    expect(saveBody(gtaw).cells).toHaveLength(3);
    expect(fillDown(draftFromGrid(grid), 'GTAW')).toEqual(draftFromGrid(grid)); // nothing typed: nothing to copy
  });

  it('issue 10 item 3: each cell has its state per code; use on or after a lapse or revocation is listed before saving', () => {
    const withPairs: Grid = {
      ...grid,
      today: '2026-11-25',
      rows: grid.rows.map((r, i) =>
        i === 0
          ? {
              ...r,
              pairs: [
                { process: 'SMAW', code: 'asme-ix', lapsesOn: '2026-11-15', revokedOn: null },
                { process: 'SMAW', code: 'aws-d1.1', lapsesOn: '2027-03-01', revokedOn: null },
                { process: 'GTAW', code: 'asme-ix', lapsesOn: '2026-11-28', revokedOn: '2026-11-28' },
              ],
            }
          : r,
      ),
    };
    const draft = draftFromGrid(withPairs);
    const row = draft.rows[0]!;
    expect(cellStates(row, 'SMAW', draft.today).map((c) => [c.label, c.kind, c.daysLeft])).toEqual([
      ['ASME IX', 'lapsed', -10],
      ['AWS D1.1', 'current', 96],
    ]);
    expect(cellStates(row, 'GTAW', draft.today).map((c) => [c.kind, c.daysLeft])).toEqual([['lapsing', 3]]);
    expect(cellStates(row, 'GTAW', '2026-11-28').map((c) => c.kind)).toEqual(['revoked']);
    const before = setCell(draft, ids[0]!, 'SMAW', { used: true, jobReference: 'J-1', usedOn: '2026-11-10' });
    expect(usesAfterLapse(before)).toEqual([]);
    const after = setCell(before, ids[0]!, 'GTAW', { used: true, jobReference: 'J-1', usedOn: '2026-11-28' });
    const late = setCell(after, ids[0]!, 'SMAW', { usedOn: '2026-11-20' });
    expect(usesAfterLapse(late).map((x) => [x.process, x.usedOn, x.codes.map((c) => c.kind)])).toEqual([
      ['SMAW', '2026-11-20', ['lapsed']],
      ['GTAW', '2026-11-28', ['revoked']],
    ]);
  });

  it('issue 8 defect 7: after a 409 the fresh grid keeps the user’s edits on the new version; take theirs drops one', () => {
    const mine = setCell(draftFromGrid(grid), ids[1]!, 'SMAW', { jobReference: 'J-MINE' });
    const theirsGrid: Grid = {
      ...grid,
      rows: grid.rows.map((r, i) =>
        i === 1 ? { ...r, cells: { ...r.cells, SMAW: { entryId: 'e1', usedOn: '2026-11-04', jobReference: 'J-THEIRS', note: '', flaggedLapsed: false, version: 2 } } } : r,
      ),
    };
    const rebased = rebaseDraft(draftFromGrid(theirsGrid), mine);
    expect(rebased.rows[1]!.cells.SMAW).toMatchObject({ jobReference: 'J-MINE', version: 2, saved: { jobReference: 'J-THEIRS' } });
    expect(saveBody(rebased).cells).toEqual([expect.objectContaining({ jobReference: 'J-MINE', version: 2 })]);
    const theirs = takeTheirs(rebased, ids[1]!, 'SMAW');
    expect(isDirty(theirs)).toBe(false);
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
