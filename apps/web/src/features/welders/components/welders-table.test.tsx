// Issue 10 item 6: the Welders list shows qualifications per process and code, so a revoked one never
// hides a current one of the same process under another code; "Soonest lapse" is the soonest one still
// ahead, with lapsed ones marked apart.
import type { Welder } from '@beadroll/rules';
import { render, screen, within } from '@testing-library/react';
import { MemoryRouter } from 'react-router-dom';
import { describe, expect, it } from 'vitest';
import { WeldersTable } from './welders-table';

type Q = NonNullable<Welder['qualifications']>[number];
const q = (over: Partial<Q>): Q => ({
  id: Math.random().toString(36).slice(2),
  process: 'GTAW',
  code: 'asme-ix',
  state: 'current',
  lapsesOn: '2027-05-01',
  daysLeft: 150,
  ...over,
});
const welder = (qualifications: Q[]): Welder => ({
  id: 'w1',
  stamp: 'PV-07',
  name: 'Test Welder',
  homeShop: { id: 's1', code: 'PV', name: 'Test Bay' },
  email: '',
  active: true,
  hasAccount: false,
  version: 1,
  createdAt: '2026-01-05T10:00:00.000Z',
  qualifications,
});

function renderRow(qualifications: Q[]) {
  render(
    <MemoryRouter>
      <WeldersTable welders={[welder(qualifications)]} sorting={[{ id: 'lapsesOn', desc: false }]} onSortingChange={() => undefined} />
    </MemoryRouter>,
  );
  const row = screen.getAllByRole('row')[1]!;
  const cells = within(row).getAllByRole('cell');
  return { qualifications: cells[5]!, soonest: cells[6]! };
}

describe('Welders list: qualifications per code, soonest lapse ahead', { timeout: 20_000 }, () => {
  it('shows a revoked ASME IX GTAW and a current AWS D1.1 GTAW side by side, each with its code', () => {
    const { qualifications } = renderRow([
      q({ code: 'asme-ix', state: 'revoked', lapsesOn: '2026-10-01', daysLeft: -60 }),
      q({ code: 'aws-d1.1', state: 'current', lapsesOn: '2027-03-01', daysLeft: 90 }),
    ]);
    const chips = within(qualifications).getAllByText(/GTAW/).map((c) => c.textContent);
    expect(chips).toEqual(['GTAW ASME IX revoked', 'GTAW AWS D1.1 current']);
    expect(within(qualifications).getByText('GTAW AWS D1.1 current').closest('[data-state]')?.getAttribute('data-state')).toBe('current');
  });

  it('gives the lapse 13 days ahead as the soonest, and the lapsed one apart', () => {
    const { soonest } = renderRow([
      q({ process: 'SMAW', state: 'lapsed', lapsesOn: '2026-11-20', daysLeft: -12 }),
      q({ process: 'GTAW', code: 'aws-d1.1', state: 'lapsing', lapsesOn: '2026-12-15', daysLeft: 13 }),
      q({ process: 'FCAW', state: 'current', lapsesOn: '2027-04-02', daysLeft: 121 }),
      q({ process: 'GMAW', state: 'revoked', lapsesOn: '2026-09-01', daysLeft: -92 }),
    ]);
    expect(soonest.textContent).toBe('2026-12-15 (GTAW AWS D1.1)and 1 lapsed');
    expect(within(soonest).getByText('and 1 lapsed').getAttribute('data-lapsed-count')).toBe('1');
  });

  it('says none ahead when every qualification has lapsed or is revoked', () => {
    const { soonest } = renderRow([
      q({ state: 'lapsed', lapsesOn: '2026-11-20', daysLeft: -12 }),
      q({ code: 'aws-d1.1', state: 'revoked', lapsesOn: '2026-09-01', daysLeft: -92 }),
    ]);
    expect(soonest.textContent).toBe('none aheadand 1 lapsed');
  });
});
