import { loginInput } from '@beadroll/rules';
import { zodResolver } from '@hookform/resolvers/zod';
import { useForm } from 'react-hook-form';
import { Link, useNavigate, useSearchParams } from 'react-router-dom';
import type { z } from 'zod';
import { Button } from '@/components/ui/button';
import { FormError, TextField } from '@/components/ui/field';
import { paths } from '@/config/paths';
import { homeFor, safeRedirect, useLogin } from '@/lib/auth';
import { applyApiError } from '@/lib/form-errors';
import { AuthLayout } from './auth-layout';

type LoginForm = z.input<typeof loginInput>;

export default function SignInRoute() {
  const [params] = useSearchParams();
  const navigate = useNavigate();
  const login = useLogin();
  const form = useForm<LoginForm, unknown, z.output<typeof loginInput>>({
    resolver: zodResolver(loginInput),
    defaultValues: { email: '', password: '' },
  });
  const { errors } = form.formState;

  const onSubmit = form.handleSubmit((input) =>
    login.mutate(input, {
      onSuccess: (me) => {
        const target = params.get('redirect');
        void navigate(target ? safeRedirect(target) : homeFor(me), { replace: true });
      },
      onError: (error) => {
        applyApiError(error, form.setError, ['email', 'password']);
        form.resetField('password', { keepError: true });
      },
    }),
  );

  return (
    <AuthLayout title="Sign in" intro={params.get('redirect') ? 'Sign in to continue where you were.' : undefined}>
      <form onSubmit={(e) => void onSubmit(e)} noValidate className="flex flex-col gap-4">
        <TextField
          label="E-mail"
          type="email"
          autoComplete="username"
          autoFocus
          error={errors.email?.message}
          {...form.register('email')}
        />
        <TextField
          label="Password"
          type="password"
          autoComplete="current-password"
          error={errors.password?.message}
          {...form.register('password')}
        />
        <FormError message={errors.root?.server?.message} />
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
