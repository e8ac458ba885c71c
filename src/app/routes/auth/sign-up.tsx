import { useForm } from 'react-hook-form';
import { zodResolver } from '@hookform/resolvers/zod';
import { Link, redirect, useNavigate, type LoaderFunctionArgs } from 'react-router';
import type { QueryClient } from '@tanstack/react-query';
import { useQuery } from '@tanstack/react-query';
import { SignUpInputSchema, type SignUpInput } from '@shared/contracts/auth';
import { sessionQueries, useSignUp } from '@/features/auth/api';
import { applyServerErrors } from '@/lib/form-errors';
import { Field, FormError } from '@/components/ui/field';
import { Button } from '@/components/ui/button';
import { EmptyState } from '@/components/ui/empty-state';
import { paths } from '../../paths';

export { RouteErrorBoundary as ErrorBoundary } from '../../route-error';

export const loader = (qc: QueryClient) => async (_args: LoaderFunctionArgs) => {
  const info = await qc.fetchQuery({ ...sessionQueries.current(), staleTime: 0 });
  if (info.user) throw redirect(paths.kitchen);
  return null;
};

export function Component() {
  const navigate = useNavigate();
  const { data: session } = useQuery(sessionQueries.current());
  const signUp = useSignUp();
  const { register, handleSubmit, setError, formState } = useForm<SignUpInput>({
    resolver: zodResolver(SignUpInputSchema),
    defaultValues: { businessName: '', displayName: '', email: '', password: '' },
  });

  if (session && !session.signupEnabled) {
    return (
      <EmptyState title="New sign-ups are turned off" icon="info">
        <p>This server does not take new businesses. If you were invited to a team, <Link to={paths.join}>use your invite code</Link>.</p>
      </EmptyState>
    );
  }

  const onSubmit = handleSubmit((input) =>
    signUp.mutateAsync(input).then(
      () => navigate(paths.kitchen, { replace: true }),
      (err) => applyServerErrors(err, setError, ['businessName', 'displayName', 'email', 'password']),
    ),
  );

  return (
    <div>
      <h1 className="text-3xl font-bold">Create a business account</h1>
      <p className="mt-2 text-muted">You become the owner. You can invite your bakers and helpers afterwards.</p>
      <form onSubmit={onSubmit} noValidate className="mt-6 space-y-4">
        <FormError message={formState.errors.root?.server?.message} />
        <Field label="Business name" autoComplete="organization" error={formState.errors.businessName?.message} {...register('businessName')} />
        <Field label="Your name" autoComplete="name" error={formState.errors.displayName?.message} {...register('displayName')} />
        <Field label="E-mail" type="email" autoComplete="email" inputMode="email" error={formState.errors.email?.message} {...register('email')} />
        <Field
          label="Password"
          type="password"
          autoComplete="new-password"
          hint="At least 8 characters. A short sentence is easy to remember and hard to guess."
          error={formState.errors.password?.message}
          {...register('password')}
        />
        <Button type="submit" isBusy={signUp.isPending} className="w-full">
          Create account
        </Button>
      </form>
      <p className="mt-6">
        Already have an account? <Link to={paths.signIn}>Sign in</Link>
      </p>
    </div>
  );
}
