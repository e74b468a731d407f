import { render, screen } from '@testing-library/react';
import { describe, expect, it } from 'vitest';
import { chipLabel, QualificationChips, soonestLapse, type QualificationState } from './qualification-chip';

const q = (over: Partial<QualificationState>): QualificationState => ({
  id: Math.random().toString(36),
  process: 'SMAW',
  code: 'asme-ix',
  state: 'current',
  lapsesOn: '2027-04-01',
  daysLeft: 120,
  ...over,
});

describe('qualification status chips', () => {
  it('say the status in words with the days left visible only while lapsing', () => {
    expect(chipLabel(q({}))).toBe('SMAW ASME IX current');
    expect(chipLabel(q({ state: 'lapsing', daysLeft: 12 }))).toBe('SMAW ASME IX lapsing · 12 days left');
    expect(chipLabel(q({ state: 'lapsing', daysLeft: 1 }))).toBe('SMAW ASME IX lapsing · 1 day left');
    expect(chipLabel(q({ state: 'lapsed', daysLeft: -3, code: 'aws-d1.1' }))).toBe('SMAW AWS D1.1 lapsed');
  });

  it('show one chip per process and code, the most urgent one, with colour, icon and the days in the title', () => {
    render(
      <QualificationChips
        qualifications={[
          q({ process: 'GTAW', state: 'lapsing', daysLeft: 9, lapsesOn: '2026-12-11' }),
          q({ process: 'GTAW', state: 'current' }),
          q({ process: 'SMAW', state: 'revoked' }),
        ]}
      />,
    );
    const lapsing = screen.getByText('GTAW ASME IX lapsing · 9 days left');
    expect(lapsing.closest('[data-tone]')?.getAttribute('data-tone')).toBe('warn');
    expect(lapsing.closest('[data-tone]')?.querySelector('svg')).not.toBeNull();
    expect(lapsing.closest('[title]')?.getAttribute('title')).toBe('GTAW to ASME IX: lapses on 11 December 2026, 9 days left');
    expect(screen.getByText('SMAW ASME IX revoked').closest('[data-tone]')?.getAttribute('data-tone')).toBe('bad');
    expect(screen.queryByText('GTAW ASME IX current')).toBeNull();
  });

  it('find the soonest lapse still ahead, leaving revoked and lapsed ones out', () => {
    const soon = q({ process: 'GMAW', lapsesOn: '2026-12-20' });
    expect(
      soonestLapse([
        q({}),
        soon,
        q({ state: 'revoked', lapsesOn: '2026-01-01', daysLeft: -300 }),
        q({ state: 'lapsed', lapsesOn: '2026-11-01', daysLeft: -30 }),
      ]),
    ).toBe(soon);
    expect(soonestLapse([])).toBeNull();
  });
});
