// The review queue of the Overview: use logged after a qualification had lapsed, which is not evidence,
// each to be reviewed by the QA manager with a decision about the welds and a note.
import type { ReviewEntry } from '@beadroll/rules';
import { useQuery } from '@tanstack/react-query';
import { useState } from 'react';
import { Link } from 'react-router-dom';
import { Button } from '@/components/ui/button';
import { Dialog, DialogActions } from '@/components/ui/dialog';
import { FormError, TextField } from '@/components/ui/field';
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

function ReviewDialog({ entry, onClose }: { entry: ReviewEntry | null; onClose: () => void }) {
  const review = useReviewEntry();
  const [note, setNote] = useState('');
  const close = () => {
    setNote('');
    review.reset();
    onClose();
  };
  return (
    <Dialog
      open={entry !== null}
      onClose={close}
      title={entry ? `Review ${entry.welder.stamp} · ${entry.process} on ${entry.usedOn}` : ''}
      description="This use was logged after the qualification had lapsed, so it does not count as evidence. Note what was decided about the welds."
    >
      {entry && (
        <form
          onSubmit={(e) => {
            e.preventDefault();
            review.mutate({ id: entry.id, note }, { onSuccess: close });
          }}
        >
          <TextField label="Disposition note" value={note} maxLength={500} onChange={(e) => setNote(e.target.value)} error={isApiError(review.error) ? review.error.fields.note : undefined} />
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
