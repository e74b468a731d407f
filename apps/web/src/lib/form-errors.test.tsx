import { zodResolver } from '@hookform/resolvers/zod';
import { render, screen } from '@testing-library/react';
import userEvent from '@testing-library/user-event';
import { useForm } from 'react-hook-form';
import { describe, expect, it } from 'vitest';
import { z } from 'zod';
import { FormError, TextField } from '@/components/ui/field';
import { ApiError, toApiError } from './api-client';
import { applyApiError, splitFieldErrors } from './form-errors';

describe('splitFieldErrors', () => {
  it('matches exact names, falls back to the parent of a dotted path, and returns the rest', () => {
    const result = splitFieldErrors({ stamp: 'taken', 'shopIds.2': 'Not a valid id', 'address.zip': 'odd', '': 'whole form' }, [
      'stamp',
      'shopIds',
    ] as const);
    expect(result.matched).toEqual([
      ['stamp', 'taken'],
      ['shopIds', 'Not a valid id'],
    ]);
    expect(result.unmatched).toEqual(['address.zip: odd', 'whole form']);
  });
});

describe('toApiError', () => {
  it('keeps code, message and fields of the API error body', () => {
    const error = toApiError(400, { error: { code: 'validation', message: 'Check the form', fields: { email: 'already has an account' } } });
    expect(error).toBeInstanceOf(ApiError);
    expect([error.status, error.code, error.message, error.fields]).toEqual([400, 'validation', 'Check the form', { email: 'already has an account' }]);
  });

  it('gives a readable message when the body is not an API error (a proxy page, an empty 502)', () => {
    const error = toApiError(502, '<html>Bad gateway</html>');
    expect(error.code).toBe('internal');
    expect(error.message).toMatch(/Something went wrong/);
    expect(toApiError(429, null).code).toBe('rate_limited');
  });
});

const schema = z.object({ stamp: z.string().min(1, 'Required'), name: z.string().min(1, 'Required') });

function WelderLikeForm({ answer }: { answer: unknown }) {
  const form = useForm<z.infer<typeof schema>>({ resolver: zodResolver(schema), defaultValues: { stamp: 'PV-07', name: 'A Welder' } });
  const onSubmit = form.handleSubmit(() => {
    applyApiError(answer, form.setError, ['stamp', 'name']);
  });
  return (
    <form onSubmit={(e) => void onSubmit(e)} noValidate>
      <TextField label="Stamp" error={form.formState.errors.stamp?.message} {...form.register('stamp')} />
      <TextField label="Name" error={form.formState.errors.name?.message} {...form.register('name')} />
      <FormError message={form.formState.errors.root?.server?.message} />
      <button type="submit">Save</button>
    </form>
  );
}

describe('applyApiError on a form', () => {
  it("puts a 400's field message next to its field and marks the field invalid", async () => {
    const user = userEvent.setup();
    const answer = toApiError(400, {
      error: { code: 'validation', message: 'Check the form', fields: { stamp: 'Stamp PV-07 is already used by another welder' } },
    });
    render(<WelderLikeForm answer={answer} />);
    await user.click(screen.getByRole('button', { name: 'Save' }));

    const stamp = await screen.findByLabelText('Stamp');
    expect(stamp.getAttribute('aria-invalid')).toBe('true');
    const describedBy = stamp.getAttribute('aria-describedby') ?? '';
    expect(document.getElementById(describedBy)?.textContent).toBe('Stamp PV-07 is already used by another welder');
    expect(screen.getByLabelText('Name').getAttribute('aria-invalid')).toBeNull();
    expect(screen.queryByRole('alert')).toBeNull();
    expect(document.activeElement).toBe(stamp);
  });

  it('shows a conflict (no fields) above the buttons instead', async () => {
    const user = userEvent.setup();
    render(<WelderLikeForm answer={toApiError(409, { error: { code: 'conflict', message: 'Someone else changed this welder' } })} />);
    await user.click(screen.getByRole('button', { name: 'Save' }));
    expect((await screen.findByRole('alert')).textContent).toContain('Someone else changed this welder');
  });

  it('shows the zod message next to the field before anything is sent', async () => {
    const user = userEvent.setup();
    render(<WelderLikeForm answer={null} />);
    await user.clear(screen.getByLabelText('Name'));
    await user.click(screen.getByRole('button', { name: 'Save' }));
    expect(await screen.findByText('Required')).toBeTruthy();
    expect(screen.getByLabelText('Name').getAttribute('aria-invalid')).toBe('true');
  });
});
