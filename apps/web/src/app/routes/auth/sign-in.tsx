import { loginInput } from '@beadroll/rules';
import { useRef } from 'react';
import { Link, useNavigate, useSearchParams } from 'react-router-dom';
import { Button } from '@/components/ui/button';
import { FormError, TextField } from '@/components/ui/field';
import { paths } from '@/config/paths';
import { homeFor, safeRedirect, useLogin } from '@/lib/auth';
import { usePlainForm } from '@/lib/plain-form';
import { AuthLayout } from './auth-layout';

const fields = ['email', 'password'] as const;

export default function SignInRoute() {
  const [params] = useSearchParams();
  const navigate = useNavigate();
  const login = useLogin();
  const formRef = useRef<HTMLFormElement>(null);
  const { errors, read, showApiError } = usePlainForm(loginInput, fields);

  function onSubmit(event: React.FormEvent<HTMLFormElement>) {
    event.preventDefault();
    const form = event.currentTarget;
    const input = read(form);
    if (!input) return;
    login.mutate(input, {
      onSuccess: (me) => {
        const target = params.get('redirect');
        void navigate(target ? safeRedirect(target) : homeFor(me), { replace: true });
      },
      onError: (error) => {
        const password = form.elements.namedItem('password');
        if (password instanceof HTMLInputElement) password.value = '';
        showApiError(formRef.current, error);
      },
    });
  }

  return (
    <AuthLayout title="Sign in" intro={params.get('redirect') ? 'Sign in to continue where you were.' : undefined}>
      <form ref={formRef} onSubmit={onSubmit} noValidate className="flex flex-col gap-4">
        <TextField label="E-mail" name="email" type="email" autoComplete="username" autoFocus error={errors.email} />
        <TextField label="Password" name="password" type="password" autoComplete="current-password" error={errors.password} />
        <FormError message={errors.form} />
        <Button type="submit" variant="primary" busy={login.isPending}>
          Sign in
        </Button>
        <Link to={paths.forgotPassword.href()} className="self-start text-sm font-semibold text-accent-700 underline">
          Forgot your password?
        </Link>
      </form>
    </AuthLayout>
  );
}
