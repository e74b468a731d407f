// Revoke a qualification for cause: the reason and the date it stops, after a plain confirmation.
import { revokeInput, type Qualification, type RevokeInput } from '@beadroll/rules';
import { zodResolver } from '@hookform/resolvers/zod';
import { useForm } from 'react-hook-form';
import { Button } from '@/components/ui/button';
import { Dialog, DialogActions } from '@/components/ui/dialog';
import { FormError, TextField } from '@/components/ui/field';
import { applyApiError } from '@/lib/form-errors';
import { codeNames } from '@/lib/codes';
import { useRevokeQualification } from '../api/revoke-qualification';

export function RevokeDialog({ qualification: q, onClose }: { qualification: Qualification; onClose: () => void }) {
  const revoke = useRevokeQualification();
  const form = useForm<RevokeInput>({ resolver: zodResolver(revokeInput), defaultValues: { revokedOn: new Date().toISOString().slice(0, 10), reason: '' } });
  const { errors } = form.formState;
  const submit = form.handleSubmit((input) =>
    revoke.mutate({ id: q.id, input }, { onSuccess: onClose, onError: (error) => applyApiError(error, form.setError, ['revokedOn', 'reason']) }),
  );
  return (
    <Dialog
      open
      onClose={onClose}
      title={`Revoke ${q.welder.stamp}'s ${codeNames[q.code]} ${q.process} qualification?`}
      description="From the date given the qualification is revoked: the welder may not weld under it, and only a new test requalifies. The record and its history are kept."
    >
      <form noValidate onSubmit={(e) => void submit(e)} className="grid gap-3">
        <TextField label="Revoked from" type="date" error={errors.revokedOn?.message} {...form.register('revokedOn')} />
        <TextField label="Reason" error={errors.reason?.message} hint="Why the welder's ability is in question, as it should read in the audit trail." {...form.register('reason')} />
        <FormError message={errors.root?.server?.message} />
        <DialogActions>
          <Button onClick={onClose} disabled={revoke.isPending}>
            Cancel
          </Button>
          <Button type="submit" variant="danger" busy={revoke.isPending}>
            Revoke qualification
          </Button>
        </DialogActions>
      </form>
    </Dialog>
  );
}
