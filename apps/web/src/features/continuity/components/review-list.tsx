// The review queue of the Overview: use logged after a qualification had lapsed, which is not evidence,
// each to be reviewed by the QA manager with a decision about the welds and a note.
import { reviewDecisionLabels, reviewDecisions, type ReviewDecision, type ReviewEntry } from '@beadroll/rules';
import { useQuery } from '@tanstack/react-query';
import { useState } from 'react';
import { Link } from 'react-router-dom';
import { Button } from '@/components/ui/button';
import { Dialog, DialogActions } from '@/components/ui/dialog';
import { FieldError, FormError, TextField } from '@/components/ui/field';
import { Card } from '@/components/ui/page-header';
import { ErrorState, LoadingState } from '@/components/ui/states';
import { paths } from '@/config/paths';
import { errorMessage, isApiError } from '@/lib/api-client';
import { continuityQueries } from '../api/continuity-queries';
import { useReviewEntry } from '../api/review-entry';

export default function ReviewList() {
  const queue = useQuery(continuityQueries.review());
  const [open, setOpen] = useState<ReviewEntry | null>(null);
  return (
    <section aria-labelledby="review-list-heading" id="review-list">
      <h2 id="review-list-heading" className="mb-2 text-sm font-semibold uppercase tracking-wide text-stone-600">
        Logged while lapsed: waiting for review
      </h2>
      {queue.isPending ? (
        <LoadingState label="Loading the review queue…" />
      ) : queue.isError ? (
        <ErrorState error={queue.error} onRetry={() => void queue.refetch()} />
      ) : queue.data.length === 0 ? (
        <Card className="p-4 text-sm text-stone-600">Nothing waits for review.</Card>
      ) : (
        <Card className="overflow-x-auto">
          <table className="min-w-full text-sm">
            <thead className="bg-stone-50 text-left">
              <tr>
                <th scope="col" className="px-3 py-2">Welder</th>
                <th scope="col" className="px-3 py-2">Process</th>
                <th scope="col" className="px-3 py-2">Used on</th>
                <th scope="col" className="px-3 py-2">Shop · job</th>
                <th scope="col" className="px-3 py-2">Logged by</th>
                <th scope="col" className="px-3 py-2"><span className="sr-only">Actions</span></th>
              </tr>
            </thead>
            <tbody className="divide-y divide-stone-100">
              {queue.data.map((e) => (
                <tr key={e.id}>
                  <td className="px-3 py-2">
                    <Link className="font-semibold text-accent-700 hover:underline" to={paths.welder.href(e.welder.id)}>
                      {e.welder.stamp}
                    </Link>{' '}
                    {e.welder.name}
                  </td>
                  <td className="px-3 py-2">{e.process}</td>
                  <td className="px-3 py-2 tabular-nums">{e.usedOn}</td>
                  <td className="px-3 py-2">
                    {e.shop.code} · {e.jobReference}
                    {e.note ? <span className="text-stone-500"> ({e.note})</span> : null}
                  </td>
                  <td className="px-3 py-2">{e.loggedBy ?? 'unknown'}</td>
                  <td className="px-3 py-2 text-right">
                    <Button size="row" onClick={() => setOpen(e)} aria-label={`Review ${e.welder.stamp} ${e.process} ${e.usedOn}`}>
                      Review
                    </Button>
                  </td>
                </tr>
              ))}
            </tbody>
          </table>
        </Card>
      )}
      <ReviewDialog entry={open} onClose={() => setOpen(null)} />
    </section>
  );
}

export function ReviewDialog({ entry, onClose }: { entry: ReviewEntry | null; onClose: () => void }) {
  const review = useReviewEntry();
  const [note, setNote] = useState('');
  const [decision, setDecision] = useState<ReviewDecision | ''>('');
  // Checked here first, so an incomplete review never leaves the dialog; the server checks again.
  const [missing, setMissing] = useState<{ decision?: string; note?: string }>({});
  const close = () => {
    setNote('');
    setDecision('');
    setMissing({});
    review.reset();
    onClose();
  };
  const serverFields = isApiError(review.error) ? review.error.fields : {};
  return (
    <Dialog
      open={entry !== null}
      onClose={close}
      title={entry ? `Review ${entry.welder.stamp} · ${entry.process} on ${entry.usedOn}` : ''}
      description="This use was logged after the qualification had lapsed, so it does not count as evidence. Note what was decided about the welds."
    >
      {entry && (
        <form
          noValidate
          onSubmit={(e) => {
            e.preventDefault();
            const problems = {
              ...(decision ? {} : { decision: 'Choose what was decided about the welds' }),
              ...(note.trim() ? {} : { note: 'Note what was done and where it is recorded (report or NCR number)' }),
            };
            setMissing(problems);
            if (!decision || Object.keys(problems).length > 0) return;
            review.mutate({ id: entry.id, decision, note: note.trim() }, { onSuccess: close });
          }}
        >
          <fieldset className="mb-3" aria-describedby={missing.decision || serverFields.decision ? 'review-decision-error' : undefined}>
            <legend className="mb-1 text-sm font-semibold text-stone-800">Decision about the welds</legend>
            {reviewDecisions.map((d) => (
              <label key={d} className="flex items-center gap-2 py-1 text-sm">
                <input
                  type="radio"
                  name="review-decision"
                  value={d}
                  checked={decision === d}
                  onChange={() => setDecision(d)}
                  className="h-4 w-4 accent-accent-700"
                />
                {reviewDecisionLabels[d]}
              </label>
            ))}
            <FieldError id="review-decision-error" message={missing.decision ?? serverFields.decision} />
          </fieldset>
          <TextField
            label="Disposition note"
            hint="What was done with the welds and where it is recorded (report or NCR number)."
            value={note}
            maxLength={500}
            required
            onChange={(e) => setNote(e.target.value)}
            error={missing.note ?? serverFields.note}
          />
          <FormError message={review.error ? errorMessage(review.error) : undefined} />
          <DialogActions>
            <Button onClick={close} disabled={review.isPending}>
              Cancel
            </Button>
            <Button type="submit" variant="primary" busy={review.isPending}>
              Mark reviewed
            </Button>
          </DialogActions>
        </form>
      )}
    </Dialog>
  );
}
