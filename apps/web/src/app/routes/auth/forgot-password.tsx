import { passwordResetRequestInput } from '@beadroll/rules';
import { zodResolver } from '@hookform/resolvers/zod';
import { useState } from 'react';
import { useForm } from 'react-hook-form';
import { Link } from 'react-router-dom';
import type { z } from 'zod';
import { Button } from '@/components/ui/button';
import { FormError, TextField } from '@/components/ui/field';
import { CheckCircleIcon } from '@/components/ui/icons';
import { paths } from '@/config/paths';
import { useRequestPasswordReset } from '@/features/auth/api/request-password-reset';
import { applyApiError } from '@/lib/form-errors';
import { AuthLayout } from './auth-layout';

type ResetForm = z.input<typeof passwordResetRequestInput>;

export default function ForgotPasswordRoute() {
  const request = useRequestPasswordReset();
  const [sentTo, setSentTo] = useState<string | null>(null);
  const form = useForm<ResetForm, unknown, z.output<typeof passwordResetRequestInput>>({
    resolver: zodResolver(passwordResetRequestInput),
    defaultValues: { email: '' },
  });

  const onSubmit = form.handleSubmit((input) =>
    request.mutate(input, {
      onSuccess: () => setSentTo(input.email),
      onError: (error) => applyApiError(error, form.setError, ['email']),
    }),
  );

  if (sentTo) {
    return (
      <AuthLayout title="Check your e-mail">
        <div role="status" className="flex gap-2 text-sm text-stone-700">
          <CheckCircleIcon className="mt-0.5 size-5 shrink-0 text-emerald-700" />
          <p>
            If <strong>{sentTo}</strong> has a Beadroll sign-in, a message with a link to choose a new password is on its
            way. The link works once, for one hour.
          </p>
        </div>
        <Link to={paths.signIn.href()} className="mt-5 inline-block text-sm font-semibold text-accent-700 underline">
          Back to sign in
        </Link>
      </AuthLayout>
    );
  }

  return (
    <AuthLayout title="Forgot your password?" intro="Enter the e-mail you sign in with and we will send you a link to choose a new password.">
      <form onSubmit={(e) => void onSubmit(e)} noValidate className="flex flex-col gap-4">
        <TextField label="E-mail" type="email" autoComplete="username" autoFocus error={form.formState.errors.email?.message} {...form.register('email')} />
        <FormError message={form.formState.errors.root?.server?.message} />
        <Button type="submit" variant="primary" busy={request.isPending}>
          Send the link
        </Button>
        <Link to={paths.signIn.href()} className="self-start text-sm font-semibold text-accent-700 underline">
          Back to sign in
        </Link>
      </form>
    </AuthLayout>
  );
}
