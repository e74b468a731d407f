// A qualification's continuity status as a chip: process, status word, icon and colour; the days left
// as a tooltip, and as visible text while it is lapsing (the one a foreman must act on).
import { StatusChip } from './status-chip';

export interface QualificationState {
  id: string;
  process: string;
  code: string;
  state: 'current' | 'lapsing' | 'lapsed' | 'revoked';
  lapsesOn: string;
  daysLeft: number;
}

const words = { current: 'current', lapsing: 'lapsing', lapsed: 'lapsed', revoked: 'revoked' } as const;

export function daysText(daysLeft: number): string {
  if (daysLeft > 0) return `${daysLeft} ${daysLeft === 1 ? 'day' : 'days'} left`;
  if (daysLeft === 0) return 'lapses today';
  return `lapsed ${-daysLeft} ${daysLeft === -1 ? 'day' : 'days'} ago`;
}

/** The chip's visible words, e.g. "GTAW lapsing · 12 days left" or "SMAW current". */
export function chipLabel(q: Pick<QualificationState, 'process' | 'state' | 'daysLeft'>): string {
  const base = `${q.process} ${words[q.state]}`;
  return q.state === 'lapsing' ? `${base} · ${daysText(q.daysLeft)}` : base;
}

export function chipTitle(q: QualificationState): string {
  if (q.state === 'revoked') return `${q.process} (${q.code}): revoked`;
  return `${q.process} (${q.code}): ${q.state === 'lapsed' ? 'lapsed on' : 'lapses on'} ${q.lapsesOn}, ${daysText(q.daysLeft)}`;
}

export function QualificationChip({ qualification }: { qualification: QualificationState }) {
  return (
    <span title={chipTitle(qualification)} data-state={qualification.state}>
      <StatusChip status={`qualification.${qualification.state}`} label={chipLabel(qualification)} />
    </span>
  );
}

/** One chip per process (the most urgent qualification of that process stands for it). */
export function QualificationChips({ qualifications }: { qualifications: QualificationState[] }) {
  if (qualifications.length === 0) return <span className="text-sm text-stone-400">none</span>;
  const rank = { revoked: 0, lapsed: 1, lapsing: 2, current: 3 } as const;
  const byProcess = new Map<string, QualificationState>();
  for (const q of qualifications) {
    const seen = byProcess.get(q.process);
    if (!seen || rank[q.state] < rank[seen.state] || (rank[q.state] === rank[seen.state] && q.lapsesOn < seen.lapsesOn))
      byProcess.set(q.process, q);
  }
  return (
    <span className="flex flex-wrap gap-1">
      {[...byProcess.values()].map((q) => (
        <QualificationChip key={q.id} qualification={q} />
      ))}
    </span>
  );
}

/** The soonest lapse among the qualifications not revoked, or null. */
export function soonestLapse(qualifications: QualificationState[]): QualificationState | null {
  return qualifications.filter((q) => q.state !== 'revoked').reduce<QualificationState | null>((a, q) => (!a || q.lapsesOn < a.lapsesOn ? q : a), null);
}
