import type { ShopRef } from '@beadroll/rules';
import type { UseFormRegisterReturn } from 'react-hook-form';
import { Checkbox, CheckboxGroup } from '@/components/ui/field';

/** The shops a foreman looks after, as one checkbox per shop registered under one form field. */
export function ShopCheckboxes({ shops, error, field }: { shops: ShopRef[]; error?: string; field: UseFormRegisterReturn }) {
  return (
    <CheckboxGroup legend="Shops" hint="The foreman sees the welders whose home shop is one of these." error={error}>
      {shops.map((shop) => (
        <Checkbox key={shop.id} value={shop.id} label={`${shop.code} · ${shop.name}`} {...field} />
      ))}
    </CheckboxGroup>
  );
}
