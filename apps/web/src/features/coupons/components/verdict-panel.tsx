// The live verdict while specimens are recorded: the result as colour, word and icon; for each reject
// the clause and the reason; the indications that did not count; the criteria set and its source.
import { Card } from '@/components/ui/page-header';
import { StatusChip } from '@/components/ui/status-chip';
import type { DraftAnalysis } from '../model/coupon-draft';

export const VERDICT_CAUTION =
  'Live evaluation by Beadroll’s rules; the server evaluates again when you save. The code edition in force, the company’s quality manual and the responsible inspector govern.';

export function VerdictPanel({ analysis }: { analysis: Pick<DraftAnalysis, 'verdict' | 'reasons' | 'notes' | 'incomplete' | 'evaluation'> & Partial<Pick<DraftAnalysis, 'notExamined'>> }) {
  const { verdict, reasons, notes, incomplete, evaluation, notExamined } = analysis;
  return (
    <Card className="p-4">
      <section aria-live="polite" aria-label="Evaluation">
        <h2 className="text-sm font-bold uppercase tracking-wide text-stone-600">Evaluation</h2>
        <div className="mt-2 text-lg" data-verdict={verdict ?? 'none'}>
          {verdict ? (
            <span className="inline-block scale-125 origin-left">
              <StatusChip status={`coupon.${verdict}`} />
            </span>
          ) : (
            <>
              {notExamined && <p className="font-semibold text-stone-800">Not yet examined</p>}
              <p className="text-sm text-stone-600">{incomplete ?? 'Record the examination to see the evaluation.'}</p>
            </>
          )}
        </div>
        {reasons.length > 0 && (
          <ul className="mt-3 space-y-2 text-sm">
            {reasons.map((r, i) => (
              <li key={i} className="rounded-md border border-red-200 bg-red-50 px-3 py-2 text-red-900">
                {r.where && <span className="font-semibold">{r.where}: </span>}
                {r.message} <span className="whitespace-nowrap rounded bg-white/70 px-1.5 text-xs font-semibold">{r.clause}</span>
              </li>
            ))}
          </ul>
        )}
        {verdict && evaluation?.retest && (
          <p className="mt-2 rounded-md bg-stone-50 px-3 py-2 text-sm text-stone-800">
            <span className="font-semibold">
              Retest as a whole: {evaluation.retest.result === 'accept' ? 'passes' : evaluation.retest.result === 'reject' ? 'fails' : `${evaluation.retest.recorded} of ${evaluation.retest.needed} coupons`}.
            </span>{' '}
            {evaluation.retest.message}
          </p>
        )}
        {verdict === 'accept' && reasons.length === 0 && (
          <p className="mt-2 text-sm text-stone-700">Every part of the examination meets the criteria.</p>
        )}
        {notes.length > 0 && (
          <ul className="mt-3 space-y-1 text-xs text-stone-600">
            {notes.map((n, i) => (
              <li key={i}>
                {n.where && <span className="font-semibold">{n.where}: </span>}
                {n.message} <span className="font-semibold">({n.clause})</span>
              </li>
            ))}
          </ul>
        )}
        {evaluation && (
          <p className="mt-3 text-xs text-stone-600">
            Judged by {evaluation.codeCriteria.name} ({evaluation.codeCriteria.clause}; {evaluation.codeCriteria.source})
            {evaluation.additionalCriteria ? `, and in addition ${evaluation.additionalCriteria.name}` : ''}
          </p>
        )}
        <p className="mt-2 text-xs text-stone-500">{VERDICT_CAUTION}</p>
      </section>
    </Card>
  );
}
