// Add or edit a welder. Editing sends the version the form started from; when someone else saved in
// between, the API answers 409 and the form offers to load their change instead of overwriting it.
import { welderInput, type ShopRef, type Welder, type WelderUpdateInput } from '@beadroll/rules';
import { zodResolver } from '@hookform/resolvers/zod';
import { useQueryClient } from '@tanstack/react-query';
import { useState } from 'react';
import { useForm } from 'react-hook-form';
import type { z } from 'zod';
import { Button } from '@/components/ui/button';
import { DialogActions } from '@/components/ui/dialog';
import { FormError, SelectField, TextField } from '@/components/ui/field';
import { ApiError } from '@/lib/api-client';
import { applyApiError, FORM_ERROR } from '@/lib/form-errors';
import { useCreateWelder } from '../api/create-welder';
import { useUpdateWelder } from '../api/update-welder';
import { welderQueries } from '../api/welder-queries';

export const WELDER_CONFLICT_MESSAGE = 'Someone else changed this welder; reload to see their change';

type WelderFormValues = z.input<typeof welderInput>;
type WelderFormOutput = z.output<typeof welderInput>;
const formFields = ['stamp', 'name', 'homeShopId', 'email'] as const;

function valuesOf(welder: Welder | undefined, shops: ShopRef[]): WelderFormValues {
  return {
    stamp: welder?.stamp ?? '',
    name: welder?.name ?? '',
    homeShopId: welder?.homeShop.id ?? (shops.length === 1 ? (shops[0]?.id ?? '') : ''),
    email: welder?.email ?? '',
  };
}

/** Only what changed, plus the version it was changed from. */
export function welderChanges(before: Welder, after: WelderFormOutput): WelderUpdateInput {
  const changes: WelderUpdateInput = { version: before.version };
  if (after.stamp !== before.stamp) changes.stamp = after.stamp;
  if (after.name !== before.name) changes.name = after.name;
  if (after.homeShopId !== before.homeShop.id) changes.homeShopId = after.homeShopId;
  if (after.email !== before.email) changes.email = after.email;
  return changes;
}

interface WelderFormProps {
  welder?: Welder;
  shops: ShopRef[];
  onDone: (welder: Welder) => void;
  onCancel: () => void;
}

export function WelderForm({ welder: initial, shops, onDone, onCancel }: WelderFormProps) {
  const queryClient = useQueryClient();
  const create = useCreateWelder();
  const update = useUpdateWelder();
  const [base, setBase] = useState(initial);
  const [conflict, setConflict] = useState(false);
  const [reloading, setReloading] = useState(false);
  const form = useForm<WelderFormValues, unknown, WelderFormOutput>({
    resolver: zodResolver(welderInput),
    defaultValues: valuesOf(initial, shops),
  });
  const { errors } = form.formState;
  const editing = base !== undefined;
  const homeShopId = form.watch('homeShopId');
  const moving = editing && homeShopId !== base.homeShop.id;

  const onError = (error: unknown) => {
    if (error instanceof ApiError && error.status === 409) {
      setConflict(true);
      form.setError(FORM_ERROR, { type: 'server', message: WELDER_CONFLICT_MESSAGE });
      return;
    }
    applyApiError(error, form.setError, formFields);
  };

  const onSubmit = form.handleSubmit((values) => {
    if (!base) {
      create.mutate(values, { onSuccess: onDone, onError });
      return;
    }
    const changes = welderChanges(base, values);
    if (Object.keys(changes).length === 1) {
      onCancel();
      return;
    }
    update.mutate({ id: base.id, input: changes }, { onSuccess: onDone, onError });
  });

  const reload = async () => {
    if (!base) return;
    setReloading(true);
    try {
      const fresh = await queryClient.fetchQuery({ ...welderQueries.detail(base.id), staleTime: 0 });
      setBase(fresh);
      setConflict(false);
      form.reset(valuesOf(fresh, shops));
    } catch (error) {
      applyApiError(error, form.setError, formFields);
    } finally {
      setReloading(false);
    }
  };

  const homeShopChoices = base && !shops.some((s) => s.id === base.homeShop.id) ? [base.homeShop, ...shops] : shops;

  return (
    <form onSubmit={(e) => void onSubmit(e)} noValidate className="grid gap-4 sm:grid-cols-2">
      <TextField
        label="Stamp"
        autoFocus
        autoCapitalize="characters"
        spellCheck={false}
        hint="The mark stamped beside this welder's welds, unique in the company."
        error={errors.stamp?.message}
        className="tabular-nums uppercase"
        {...form.register('stamp')}
      />
      <TextField label="Name" autoComplete="off" error={errors.name?.message} {...form.register('name')} />
      <SelectField
        label="Home shop"
        error={errors.homeShopId?.message}
        hint={moving ? 'Moving the welder to another home shop is recorded in the audit trail.' : undefined}
        {...form.register('homeShopId')}
      >
        <option value="">Choose a shop…</option>
        {homeShopChoices.map((shop) => (
          <option key={shop.id} value={shop.id}>
            {shop.code} · {shop.name}
          </option>
        ))}
      </SelectField>
      <TextField
        label="Contact e-mail"
        type="email"
        autoComplete="off"
        hint="Optional. Needed to give the welder a sign-in."
        error={errors.email?.message}
        {...form.register('email')}
      />
      <div className="sm:col-span-2">
        <FormError message={errors.root?.server?.message} />
        {conflict && (
          <Button className="mt-2" onClick={() => void reload()} busy={reloading}>
            Reload their change
          </Button>
        )}
        <DialogActions>
          <Button onClick={onCancel}>Cancel</Button>
          <Button type="submit" variant="primary" busy={create.isPending || update.isPending} disabled={conflict}>
            {editing ? 'Save changes' : 'Add welder'}
          </Button>
        </DialogActions>
      </div>
    </form>
  );
}
