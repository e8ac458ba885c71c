import { useForm } from 'react-hook-form';
import { zodResolver } from '@hookform/resolvers/zod';
import { Link, redirect, useNavigate, useSearchParams, type LoaderFunctionArgs } from 'react-router';
import type { QueryClient } from '@tanstack/react-query';
import { useQuery } from '@tanstack/react-query';
import { SignInInputSchema, type SignInInput, type DemoAccount } from '@shared/contracts/auth';
import { sessionQueries, useSignIn } from '@/features/auth/api';
import { applyServerErrors } from '@/lib/form-errors';
import { Field, FormError } from '@/components/ui/field';
import { Button } from '@/components/ui/button';
import { CautionBox } from '@/components/ui/caution-box';
import { ROLE_LABELS } from '../../nav';
import { isSafeNext, paths } from '../../paths';

export { RouteErrorBoundary as ErrorBoundary } from '../../route-error';

function nextFrom(search: URLSearchParams): string {
  const next = search.get('next');
  return isSafeNext(next) ? next : paths.kitchen;
}

export const loader = (qc: QueryClient) => async ({ request }: LoaderFunctionArgs) => {
  // Always fresh here: the page may open right after the session ended.
  const info = await qc.fetchQuery({ ...sessionQueries.current(), staleTime: 0 });
  if (info.user) throw redirect(nextFrom(new URL(request.url).searchParams));
  return null;
};

function DemoAccounts({ accounts, onPick }: { accounts: DemoAccount[]; onPick: (a: DemoAccount) => void }) {
  return (
    <section aria-labelledby="demo-heading" className="mt-8 rounded-card border border-hairline bg-surface p-4">
      <h2 id="demo-heading" className="text-lg font-bold">
        Demo accounts
      </h2>
      <p className="text-sm text-muted">This server runs with invented demo data. Choose a person to fill in the form, then sign in.</p>
      <ul className="mt-3 space-y-2">
        {accounts.map((a) => (
          <li key={a.email}>
            <button
              type="button"
              onClick={() => onPick(a)}
              className="w-full rounded-control border border-edge bg-surface px-3 py-2 text-left hover:bg-berry-soft"
            >
              <span className="block font-bold">
                {a.displayName} · {ROLE_LABELS[a.role]}
              </span>
              <span className="block text-sm text-muted">
                {a.email} · password <span className="font-bold text-ink">{a.password}</span>
              </span>
            </button>
          </li>
        ))}
      </ul>
    </section>
  );
}

export function Component() {
  const [search] = useSearchParams();
  const navigate = useNavigate();
  const { data: session } = useQuery(sessionQueries.current());
  const signIn = useSignIn();
  const form = useForm<SignInInput>({ resolver: zodResolver(SignInInputSchema), defaultValues: { email: '', password: '' } });
  const { register, handleSubmit, setError, setValue, setFocus, formState } = form;
  const reason = search.get('reason');

  const onSubmit = handleSubmit((input) =>
    signIn.mutateAsync(input).then(
      () => navigate(nextFrom(search), { replace: true }),
      (err) => applyServerErrors(err, setError, ['email', 'password']),
    ),
  );

  return (
    <div>
      <h1 className="text-3xl font-bold">Sign in</h1>
      {reason === 'expired' ? (
        <div role="status" className="mt-4">
          <CautionBox title="Your session ended">
            <p>You were signed out after a while without activity. Sign in again to carry on; what you were typing is kept in this tab.</p>
          </CautionBox>
        </div>
      ) : null}
      {reason === 'signed-out' ? (
        <p role="status" className="mt-4 rounded-card border border-pistachio bg-pistachio-soft p-3 font-bold">
          You are signed out.
        </p>
      ) : null}
      <form onSubmit={onSubmit} noValidate className="mt-6 space-y-4">
        <FormError message={formState.errors.root?.server?.message} />
        <Field label="E-mail" type="email" autoComplete="username" inputMode="email" error={formState.errors.email?.message} {...register('email')} />
        <Field label="Password" type="password" autoComplete="current-password" error={formState.errors.password?.message} {...register('password')} />
        <Button type="submit" isBusy={signIn.isPending} className="w-full">
          Sign in
        </Button>
      </form>
      <p className="mt-6">
        Joining a team? <Link to={paths.join}>Use your invite code</Link>
      </p>
      {session?.signupEnabled ? (
        <p className="mt-2">
          New to Crumbtrail? <Link to={paths.signUp}>Create a business account</Link>
        </p>
      ) : null}
      {session && session.demoAccounts.length > 0 ? (
        <DemoAccounts
          accounts={session.demoAccounts}
          onPick={(a) => {
            setValue('email', a.email, { shouldValidate: false });
            setValue('password', a.password, { shouldValidate: false });
            setFocus('password');
          }}
        />
      ) : null}
    </div>
  );
}
