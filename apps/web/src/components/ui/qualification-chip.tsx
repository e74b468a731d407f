// A qualification's continuity status as a chip: process, code, status word, icon and colour; the days
// left as a tooltip, and as visible text while it is lapsing (the one a foreman must act on).
import { codeNames, formatDay, type CodeId } from '@beadroll/rules';
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

/** The code's own name ("ASME IX"), never its internal id. */
export const codeName = (code: string): string => codeNames[code as CodeId] ?? code;

/** The chip's visible words, e.g. "GTAW ASME IX lapsing · 12 days left" or "SMAW AWS D1.1 current". */
export function chipLabel(q: Pick<QualificationState, 'process' | 'code' | 'state' | 'daysLeft'>): string {
  const base = `${q.process} ${codeName(q.code)} ${words[q.state]}`;
  return q.state === 'lapsing' ? `${base} · ${daysText(q.daysLeft)}` : base;
}

export function chipTitle(q: QualificationState): string {
  const what = `${q.process} to ${codeName(q.code)}`;
  if (q.state === 'revoked') return `${what}: revoked`;
  return `${what}: ${q.state === 'lapsed' ? 'lapsed on' : 'lapses on'} ${formatDay(q.lapsesOn, 'long')}, ${daysText(q.daysLeft)}`;
}

export function QualificationChip({ qualification }: { qualification: QualificationState }) {
  return (
    <span title={chipTitle(qualification)} data-state={qualification.state}>
      <StatusChip status={`qualification.${qualification.state}`} label={chipLabel(qualification)} />
    </span>
  );
}

/**
 * One chip per process and code: a qualification under one code never stands for, or hides, one of the
 * same process under another code (a revoked ASME IX GTAW beside a current AWS D1.1 GTAW shows both).
 * Within one process and code the most urgent stands for the others.
 */
export function QualificationChips({ qualifications }: { qualifications: QualificationState[] }) {
  if (qualifications.length === 0) return <span className="text-sm text-stone-400">none</span>;
  const rank = { revoked: 0, lapsed: 1, lapsing: 2, current: 3 } as const;
  const byPair = new Map<string, QualificationState>();
  for (const q of qualifications) {
    const key = `${q.process} ${q.code}`;
    const seen = byPair.get(key);
    if (!seen || rank[q.state] < rank[seen.state] || (rank[q.state] === rank[seen.state] && q.lapsesOn < seen.lapsesOn))
      byPair.set(key, q);
  }
  const chips = [...byPair.values()].sort((a, b) => a.process.localeCompare(b.process) || codeName(a.code).localeCompare(codeName(b.code)));
  return (
    <span className="flex flex-wrap gap-1">
      {chips.map((q) => (
        <QualificationChip key={q.id} qualification={q} />
      ))}
    </span>
  );
}

/**
 * The soonest lapse still ahead (today or later) among the qualifications in force, or null; lapsed and
 * revoked ones are not "soonest" — `lapsedCount` counts the lapsed ones, shown apart.
 */
export function soonestLapse(qualifications: QualificationState[]): QualificationState | null {
  return qualifications
    .filter((q) => (q.state === 'current' || q.state === 'lapsing') && q.daysLeft >= 0)
    .reduce<QualificationState | null>((a, q) => (!a || q.lapsesOn < a.lapsesOn ? q : a), null);
}

/** How many of the qualifications have lapsed (not revoked). */
export function lapsedCount(qualifications: QualificationState[]): number {
  return qualifications.filter((q) => q.state === 'lapsed').length;
}
