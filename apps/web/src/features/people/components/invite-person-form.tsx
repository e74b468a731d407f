// Invite a person: a QA manager, a foreman with the shops they look after, or a welder for their own
// welder record. The invitation e-mail carries a link to choose a password.
import { personInput, type ShopRef, type Welder } from '@beadroll/rules';
import { zodResolver } from '@hookform/resolvers/zod';
import { useForm } from 'react-hook-form';
import type { z } from 'zod';
import { Button } from '@/components/ui/button';
import { DialogActions } from '@/components/ui/dialog';
import { FormError, SelectField, TextField } from '@/components/ui/field';
import { roleLabels } from '@/lib/auth';
import { applyApiError } from '@/lib/form-errors';
import { useInvitePerson } from '../api/invite-person';
import { ShopCheckboxes } from './shop-checkboxes';

type InviteValues = z.input<typeof personInput>;
type InviteOutput = z.output<typeof personInput>;

interface InvitePersonFormProps {
  shops: ShopRef[];
  /** Welder records that have no sign-in yet. */
  welders: Welder[];
  onDone: () => void;
  onCancel: () => void;
}

export function InvitePersonForm({ shops, welders, onDone, onCancel }: InvitePersonFormProps) {
  const invite = useInvitePerson();
  const form = useForm<InviteValues, unknown, InviteOutput>({
    resolver: zodResolver(personInput),
    defaultValues: { email: '', name: '', role: 'foreman', shopIds: [], welderId: undefined },
  });
  const { errors } = form.formState;
  const role = form.watch('role');

  const onSubmit = form.handleSubmit((values) => {
    const input = {
      email: values.email,
      name: values.name,
      role: values.role,
      shopIds: values.role === 'foreman' ? values.shopIds : [],
      ...(values.role === 'welder' ? { welderId: values.welderId } : {}),
    };
    invite.mutate(input, {
      onSuccess: onDone,
      onError: (error) => applyApiError(error, form.setError, ['email', 'name', 'role', 'shopIds', 'welderId']),
    });
  });

  const welderField = form.register('welderId', {
    setValueAs: (v: string) => (v ? v : undefined),
    onChange: (event: { target: { value: string } }) => {
      const chosen = welders.find((w) => w.id === event.target.value);
      if (!chosen) return;
      if (!form.getValues('name')) form.setValue('name', chosen.name);
      if (!form.getValues('email') && chosen.email) form.setValue('email', chosen.email);
    },
  });

  return (
    <form onSubmit={(e) => void onSubmit(e)} noValidate className="grid gap-4">
      <SelectField label="Role" autoFocus error={errors.role?.message} {...form.register('role')}>
        <option value="foreman">{roleLabels.foreman}: logs continuity and watches a crew</option>
        <option value="welder">{roleLabels.welder}: sees their own record</option>
        <option value="qa_manager">{roleLabels.qa_manager}: everything in the company</option>
      </SelectField>
      {role === 'welder' && (
        <SelectField
          label="Welder record"
          error={errors.welderId?.message}
          hint={welders.length === 0 ? 'Every active welder already has a sign-in.' : 'The sign-in will show this record only.'}
          {...welderField}
        >
          <option value="">Choose a welder…</option>
          {welders.map((w) => (
            <option key={w.id} value={w.id}>
              {w.stamp} · {w.name}
            </option>
          ))}
        </SelectField>
      )}
      <div className="grid gap-4 sm:grid-cols-2">
        <TextField label="Name" autoComplete="off" error={errors.name?.message} {...form.register('name')} />
        <TextField label="E-mail" type="email" autoComplete="off" error={errors.email?.message} {...form.register('email')} />
      </div>
      {role === 'foreman' && (
        <ShopCheckboxes shops={shops} error={errors.shopIds?.message} field={form.register('shopIds')} />
      )}
      <FormError message={errors.root?.server?.message} />
      <DialogActions>
        <Button onClick={onCancel}>Cancel</Button>
        <Button type="submit" variant="primary" busy={invite.isPending}>
          Send invitation
        </Button>
      </DialogActions>
    </form>
  );
}
