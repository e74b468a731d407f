// Create a shop or rename one (name, code, location). The code is unique within the company.
import { shopInput, type Shop } from '@beadroll/rules';
import { zodResolver } from '@hookform/resolvers/zod';
import { useForm } from 'react-hook-form';
import type { z } from 'zod';
import { Button } from '@/components/ui/button';
import { DialogActions } from '@/components/ui/dialog';
import { FormError, TextField } from '@/components/ui/field';
import { applyApiError } from '@/lib/form-errors';
import { useCreateShop } from '../api/create-shop';
import { useUpdateShop } from '../api/update-shop';

type ShopFormValues = z.input<typeof shopInput>;
type ShopFormOutput = z.output<typeof shopInput>;

export function ShopForm({ shop, onDone, onCancel }: { shop?: Shop; onDone: () => void; onCancel: () => void }) {
  const create = useCreateShop();
  const update = useUpdateShop();
  const form = useForm<ShopFormValues, unknown, ShopFormOutput>({
    resolver: zodResolver(shopInput),
    defaultValues: { name: shop?.name ?? '', code: shop?.code ?? '', location: shop?.location ?? '' },
  });
  const { errors } = form.formState;
  const onError = (error: unknown) => applyApiError(error, form.setError, ['name', 'code', 'location']);

  const onSubmit = form.handleSubmit((values) => {
    if (shop) update.mutate({ id: shop.id, input: values }, { onSuccess: onDone, onError });
    else create.mutate(values, { onSuccess: onDone, onError });
  });

  return (
    <form onSubmit={(e) => void onSubmit(e)} noValidate className="grid gap-4 sm:grid-cols-[8rem_minmax(0,1fr)]">
      <TextField
        label="Code"
        autoFocus={!shop}
        autoCapitalize="characters"
        spellCheck={false}
        className="tabular-nums uppercase"
        hint="2–12 letters or digits"
        error={errors.code?.message}
        {...form.register('code')}
      />
      <TextField label="Name" autoFocus={Boolean(shop)} error={errors.name?.message} {...form.register('name')} />
      <TextField
        label="Location"
        wrapperClassName="sm:col-span-2"
        hint="Optional: site or address, as the crew knows it."
        error={errors.location?.message}
        {...form.register('location')}
      />
      <div className="sm:col-span-2">
        <FormError message={errors.root?.server?.message} />
        <DialogActions>
          <Button onClick={onCancel}>Cancel</Button>
          <Button type="submit" variant="primary" busy={create.isPending || update.isPending}>
            {shop ? 'Save' : 'Create shop'}
          </Button>
        </DialogActions>
      </div>
    </form>
  );
}
