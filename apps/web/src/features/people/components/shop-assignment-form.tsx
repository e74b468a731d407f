// Change which shops a foreman looks after. The list replaces the old one.
import { personUpdateInput, type Person, type ShopRef } from '@beadroll/rules';
import { zodResolver } from '@hookform/resolvers/zod';
import { useForm } from 'react-hook-form';
import { z } from 'zod';
import { Button } from '@/components/ui/button';
import { DialogActions } from '@/components/ui/dialog';
import { FormError } from '@/components/ui/field';
import { applyApiError } from '@/lib/form-errors';
import { useUpdatePerson } from '../api/update-person';
import { ShopCheckboxes } from './shop-checkboxes';

const assignmentForm = z.object({
  shopIds: z.array(z.string()).min(1, 'Assign the foreman to at least one shop').pipe(personUpdateInput.shape.shopIds.unwrap()),
});
type AssignmentValues = z.infer<typeof assignmentForm>;

export function ShopAssignmentForm({ person, shops, onDone, onCancel }: { person: Person; shops: ShopRef[]; onDone: () => void; onCancel: () => void }) {
  const update = useUpdatePerson({ successMessage: `${person.name}'s shops saved` });
  const form = useForm<AssignmentValues>({
    resolver: zodResolver(assignmentForm),
    defaultValues: { shopIds: person.shops.map((s) => s.id) },
  });
  const { errors } = form.formState;
  const onSubmit = form.handleSubmit((values) =>
    update.mutate(
      { id: person.id, input: { shopIds: values.shopIds } },
      { onSuccess: onDone, onError: (error) => applyApiError(error, form.setError, ['shopIds']) },
    ),
  );
  const choices = [...shops, ...person.shops.filter((s) => !shops.some((o) => o.id === s.id))];
  return (
    <form onSubmit={(e) => void onSubmit(e)} noValidate className="grid gap-4">
      <ShopCheckboxes shops={choices} error={errors.shopIds?.message} field={form.register('shopIds')} />
      <FormError message={errors.root?.server?.message} />
      <DialogActions>
        <Button onClick={onCancel}>Cancel</Button>
        <Button type="submit" variant="primary" busy={update.isPending}>
          Save shops
        </Button>
      </DialogActions>
    </form>
  );
}
