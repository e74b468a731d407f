// One certified qualification: code and process, status as colour + word + icon, the day it lapses and
// the days left, the ranges in plain words with the clause behind each limit, who certified it, and
// its WPQ record as a PDF.
import { formatDay, type Qualification } from '@beadroll/rules';
import type { ReactNode } from 'react';
import { RANGES_CAUTION, RangesView, rangesViewSchema } from '@/components/ui/ranges-view';
import { buttonClasses } from '@/components/ui/button';
import { StatusChip } from '@/components/ui/status-chip';
import { codeNames } from '@/lib/codes';
import { wpqPdfUrl } from '../api/qualification-queries';

export function daysLeftWords(q: Qualification): string {
  if (q.status.state === 'revoked') return `Revoked from ${formatDay(q.revokedOn ?? q.status.lapsesOn, 'long')}`;
  if (q.status.daysLeft <= 0) return `Lapsed on ${formatDay(q.status.lapsesOn, 'long')}`;
  return `${q.status.daysLeft} ${q.status.daysLeft === 1 ? 'day' : 'days'} left · lapses on ${formatDay(q.status.lapsesOn, 'long')}`;
}

export function QualificationCard({
  qualification: q,
  actions,
  showSources = false,
}: {
  qualification: Qualification;
  actions?: ReactNode;
  /** The QA manager also sees where each limit's value comes from. */
  showSources?: boolean;
}) {
  const ranges = rangesViewSchema.safeParse(q.ranges);
  const title = `${codeNames[q.code]} · ${q.process}${q.transferMode ? ` (${q.transferMode})` : ''}${q.progression ? ` · ${q.progression}` : ''}`;
  return (
    <article aria-label={`Qualification ${title}`} className="rounded-lg border border-stone-200 bg-white p-4 shadow-sm">
      <div className="flex flex-wrap items-center gap-3">
        <h3 className="text-base font-bold">{title}</h3>
        <StatusChip status={q.supersededById ? 'qualification.superseded' : `qualification.${q.status.state}`} />
        <span className="text-sm text-stone-700">{daysLeftWords(q)}</span>
      </div>
      <p className="mt-1 text-xs text-stone-600">
        Certified on {formatDay(q.certifiedOn, 'long')} by {q.certifiedBy.name} · last evidence {formatDay(q.status.lastEvidence, 'long')} · rules version {q.rulesVersion}
      </p>
      {q.revokedReason && <p className="mt-1 text-sm text-red-800">Revoked: {q.revokedReason}</p>}
      <div className="mt-3">
        {ranges.success ? <RangesView ranges={ranges.data} showSources={showSources} /> : <p className="text-sm text-stone-600">The stored ranges could not be read. {RANGES_CAUTION}</p>}
      </div>
      {/* Everyone who sees the qualification may download its record (QA, the welder's foreman, the welder). */}
      <div className="mt-3 flex flex-wrap gap-2">
        <a className={buttonClasses('secondary')} href={wpqPdfUrl(q.id)} download>
          Download the WPQ PDF
        </a>
        {actions}
      </div>
    </article>
  );
}
