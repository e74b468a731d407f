// Qualifications imported from paper WPQs whose stated ranges differ from the ranges the rules compute from
// the same coupon. Both are kept; the QA manager settles each: the computed ranges stand, or the
// qualification is narrowed to what both allow (never wider than the rules).
import { useMutation, useQuery, useQueryClient } from '@tanstack/react-query';
import { useState } from 'react';
import { paperSettlementNames, type PaperRecord } from '@beadroll/rules';
import { Button } from '@/components/ui/button';
import { Dialog, DialogActions } from '@/components/ui/dialog';
import { FormError, TextField } from '@/components/ui/field';
import { ErrorState, LoadingState } from '@/components/ui/states';
import { ApiError, errorMessage } from '@/lib/api-client';
import { paperRecordQueries, settlePaperRecord } from '../api/imports';

type Settlement = keyof typeof paperSettlementNames;

function SettleDialog({ record, settlement, onClose }: { record: PaperRecord; settlement: Settlement; onClose: () => void }) {
  const queryClient = useQueryClient();
  const [note, setNote] = useState('');
  const settle = useMutation({
    mutationFn: () => settlePaperRecord(record.qualificationId, { settlement, note }),
    onSuccess: async () => {
      await queryClient.invalidateQueries({ queryKey: paperRecordQueries.all() });
      await queryClient.invalidateQueries({ queryKey: ['qualifications'] });
      onClose();
    },
  });
  const fieldError = settle.error instanceof ApiError ? settle.error.fields.note : undefined;
  return (
    <Dialog
      open
      onClose={onClose}
      title={`${paperSettlementNames[settlement]}: ${record.welder.stamp} ${record.process}, ${record.number}`}
      description={
        settlement === 'computed'
          ? 'The ranges the rules compute from the coupon stay on the qualification; the paper record is kept as it was.'
          : 'Each differing variable is narrowed to what both the rules and the paper record allow; nothing becomes wider than the rules compute.'
      }
    >
      <form
        onSubmit={(e) => {
          e.preventDefault();
          settle.mutate();
        }}
      >
        <TextField label="Why (kept in the audit trail)" value={note} onChange={(e) => setNote(e.target.value)} error={fieldError} required autoFocus />
        <FormError message={settle.isError && !fieldError ? errorMessage(settle.error) : undefined} />
        <DialogActions>
          <Button onClick={onClose} disabled={settle.isPending}>Cancel</Button>
          <Button type="submit" variant="primary" busy={settle.isPending}>Settle</Button>
        </DialogActions>
      </form>
    </Dialog>
  );
}

export function PaperRecordDifferences() {
  const list = useQuery(paperRecordQueries.open());
  const [settling, setSettling] = useState<{ record: PaperRecord; settlement: Settlement } | null>(null);
  if (list.isPending) return <LoadingState label="Loading paper records…" />;
  if (list.isError) return <ErrorState error={list.error} onRetry={() => void list.refetch()} />;
  if (list.data.items.length === 0) return null;
  return (
    <section aria-label="Paper records to settle" className="mt-4 rounded-lg border border-amber-300 bg-amber-50 p-4">
      <h2 className="text-lg font-bold">Paper records to settle ({list.data.items.length})</h2>
      <p className="text-sm text-stone-700">
        These imported WPQs state ranges other than the rules compute from their coupon. Both are kept. The code edition in force,
        your quality manual and the responsible inspector govern; each computed limit names its clause on the WPQ record.
      </p>
      <ul className="mt-3 space-y-3">
        {list.data.items.map((r) => (
          <li key={r.qualificationId} className="rounded border border-stone-200 bg-white p-3" aria-label={`${r.welder.stamp} ${r.process} ${r.testedOn}`}>
            <p className="font-semibold">
              {r.welder.stamp} {r.welder.name} · {r.process} · tested {r.testedOn} · {r.number} (row {r.line} of the file)
            </p>
            <table className="mt-2 w-full text-sm">
              <thead>
                <tr className="text-left">
                  <th className="py-1 pr-3">Variable</th>
                  <th className="py-1 pr-3">The rules compute</th>
                  <th className="py-1">The paper record states</th>
                </tr>
              </thead>
              <tbody>
                {r.differences.map((d) => (
                  <tr key={d.variable} className="border-t border-stone-100">
                    <td className="py-1 pr-3">{d.label}</td>
                    <td className="py-1 pr-3">{d.computed}</td>
                    <td className="py-1">{d.stated}</td>
                  </tr>
                ))}
              </tbody>
            </table>
            <div className="mt-2 flex flex-wrap gap-2">
              <Button size="row" onClick={() => setSettling({ record: r, settlement: 'computed' })}>{paperSettlementNames.computed}</Button>
              <Button size="row" onClick={() => setSettling({ record: r, settlement: 'narrowed' })}>Narrow to what both allow</Button>
            </div>
          </li>
        ))}
      </ul>
      {settling && <SettleDialog record={settling.record} settlement={settling.settlement} onClose={() => setSettling(null)} />}
    </section>
  );
}
