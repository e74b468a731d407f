import { formatInstant, passwordSchema, type TokenInfo } from '@beadroll/rules';
import { useQuery } from '@tanstack/react-query';
import { Link, useNavigate, useSearchParams } from 'react-router-dom';
import { z } from 'zod';
import { Button } from '@/components/ui/button';
import { FormError, TextField } from '@/components/ui/field';
import { AlertIcon } from '@/components/ui/icons';
import { LoadingState } from '@/components/ui/states';
import { paths } from '@/config/paths';
import { useSetPassword } from '@/features/auth/api/set-password';
import { tokenQueries } from '@/features/auth/api/token-queries';
import { ApiError, errorMessage } from '@/lib/api-client';
import { homeFor } from '@/lib/auth';
import { usePlainForm } from '@/lib/plain-form';
import { AuthLayout } from './auth-layout';

const passwordForm = z
  .object({ password: passwordSchema, confirm: z.string() })
  .refine((v) => v.password === v.confirm, { path: ['confirm'], message: 'The two passwords differ' });
const passwordFields = ['password', 'confirm'] as const;

function LinkProblem({ message }: { message: string }) {
  return (
    <AuthLayout title="This link cannot be used">
      <div role="alert" className="flex gap-2 text-sm text-stone-700">
        <AlertIcon className="mt-0.5 size-5 shrink-0 text-red-700" />
        <p>{message}</p>
      </div>
      <p className="mt-4 text-sm text-stone-600">
        Ask your QA manager for a new invitation, or{' '}
        <Link to={paths.forgotPassword.href()} className="font-semibold text-accent-700 underline">
          request a new password link
        </Link>
        .
      </p>
    </AuthLayout>
  );
}

function SetPasswordForm({ token, info }: { token: string; info: Extract<TokenInfo, { usable: true }> }) {
  const navigate = useNavigate();
  const setPassword = useSetPassword();
  const { errors, read, showApiError } = usePlainForm(passwordForm, passwordFields);

  function onSubmit(event: React.FormEvent<HTMLFormElement>) {
    event.preventDefault();
    const form = event.currentTarget;
    const input = read(form);
    if (!input) return;
    setPassword.mutate(
      { token, password: input.password },
      {
        onSuccess: (me) => void navigate(homeFor(me), { replace: true }),
        onError: (error) => showApiError(form, error),
      },
    );
  }

  const invitation = info.purpose === 'invitation';
  return (
    <AuthLayout
      title={invitation ? 'Choose your password' : 'Choose a new password'}
      intro={
        <>
          {invitation ? `Welcome, ${info.name}. ` : ''}This sets the password for <strong>{info.email}</strong>. The link works
          until {formatInstant(info.expiresAt, info.timeZone, 'long')}.
        </>
      }
    >
      <form onSubmit={onSubmit} noValidate className="flex flex-col gap-4">
        {/* Lets password managers file the new password under the right account. */}
        <input type="email" name="username" autoComplete="username" value={info.email} readOnly hidden />
        <TextField
          label="New password"
          name="password"
          type="password"
          autoComplete="new-password"
          autoFocus
          hint="At least 10 characters."
          error={errors.password}
        />
        <TextField
          label="Repeat the password"
          name="confirm"
          type="password"
          autoComplete="new-password"
          error={errors.confirm}
        />
        <FormError message={errors.form} />
        <Button type="submit" variant="primary" busy={setPassword.isPending}>
          Set password and sign in
        </Button>
      </form>
    </AuthLayout>
  );
}

export default function SetPasswordRoute() {
  const [params] = useSearchParams();
  const token = params.get('token') ?? '';
  const info = useQuery({ ...tokenQueries.info(token), enabled: token.length > 0 });

  if (!token) return <LinkProblem message="This address has no sign-in link in it. Open the link from your e-mail again." />;
  if (info.isPending) {
    return (
      <AuthLayout title="Checking your link">
        <LoadingState label="Checking the link…" />
      </AuthLayout>
    );
  }
  if (info.isError) {
    const error = info.error;
    const message = error instanceof ApiError && error.fields.token ? error.fields.token : errorMessage(error);
    return <LinkProblem message={message} />;
  }
  if (!info.data.usable) return <LinkProblem message={info.data.message} />;
  return <SetPasswordForm token={token} info={info.data} />;
}
