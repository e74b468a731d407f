import { passwordSchema, type TokenInfo } from '@beadroll/rules';
import { zodResolver } from '@hookform/resolvers/zod';
import { useQuery } from '@tanstack/react-query';
import { useForm } from 'react-hook-form';
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
import { applyApiError } from '@/lib/form-errors';
import { AuthLayout } from './auth-layout';

const passwordForm = z
  .object({ password: passwordSchema, confirm: z.string() })
  .refine((v) => v.password === v.confirm, { path: ['confirm'], message: 'The two passwords differ' });
type PasswordForm = z.infer<typeof passwordForm>;

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

function SetPasswordForm({ token, info }: { token: string; info: TokenInfo }) {
  const navigate = useNavigate();
  const setPassword = useSetPassword();
  const form = useForm<PasswordForm>({ resolver: zodResolver(passwordForm), defaultValues: { password: '', confirm: '' } });
  const { errors } = form.formState;

  const onSubmit = form.handleSubmit(({ password }) =>
    setPassword.mutate(
      { token, password },
      {
        onSuccess: (me) => void navigate(homeFor(me), { replace: true }),
        onError: (error) => applyApiError(error, form.setError, ['password']),
      },
    ),
  );

  const invitation = info.purpose === 'invitation';
  return (
    <AuthLayout
      title={invitation ? 'Choose your password' : 'Choose a new password'}
      intro={
        <>
          {invitation ? `Welcome, ${info.name}. ` : ''}This sets the password for <strong>{info.email}</strong>. The link works
          until {new Date(info.expiresAt).toLocaleString()}.
        </>
      }
    >
      <form onSubmit={(e) => void onSubmit(e)} noValidate className="flex flex-col gap-4">
        {/* Lets password managers file the new password under the right account. */}
        <input type="email" name="username" autoComplete="username" value={info.email} readOnly hidden />
        <TextField
          label="New password"
          type="password"
          autoComplete="new-password"
          autoFocus
          hint="At least 10 characters."
          error={errors.password?.message}
          {...form.register('password')}
        />
        <TextField
          label="Repeat the password"
          type="password"
          autoComplete="new-password"
          error={errors.confirm?.message}
          {...form.register('confirm')}
        />
        <FormError message={errors.root?.server?.message} />
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
  return <SetPasswordForm token={token} info={info.data} />;
}
