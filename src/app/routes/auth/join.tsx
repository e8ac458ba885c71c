import { useState } from 'react';
import { useForm } from 'react-hook-form';
import { zodResolver } from '@hookform/resolvers/zod';
import { Link, useNavigate } from 'react-router';
import { z } from 'zod';
import { AcceptInviteInputSchema, type AcceptInviteInput, type InvitePreview } from '@shared/contracts/team';
import { useAcceptInvite, usePreviewInvite } from '@/features/team/api';
import { applyServerErrors } from '@/lib/form-errors';
import { Field, FormError } from '@/components/ui/field';
import { Button } from '@/components/ui/button';
import { ROLE_LABELS } from '../../nav';
import { paths } from '../../paths';

export { RouteErrorBoundary as ErrorBoundary } from '../../route-error';

const CodeFormSchema = AcceptInviteInputSchema.pick({ code: true });
type CodeForm = z.infer<typeof CodeFormSchema>;

function CodeStep({ onFound }: { onFound: (code: string, preview: InvitePreview) => void }) {
  const preview = usePreviewInvite();
  const { register, handleSubmit, setError, formState } = useForm<CodeForm>({ resolver: zodResolver(CodeFormSchema), defaultValues: { code: '' } });
  const onSubmit = handleSubmit(({ code }) =>
    preview.mutateAsync(code).then(
      (p) => onFound(code, p),
      (err) => applyServerErrors(err, setError, ['code']),
    ),
  );
  return (
    <form onSubmit={onSubmit} noValidate className="mt-6 space-y-4">
      <FormError message={formState.errors.root?.server?.message} />
      <Field label="Invite code" hint="The business owner gave you this code. Paste it or type it in." autoComplete="one-time-code" error={formState.errors.code?.message} {...register('code')} />
      <Button type="submit" isBusy={preview.isPending} className="w-full">
        Continue
      </Button>
    </form>
  );
}

function AcceptStep({ code, invite }: { code: string; invite: InvitePreview }) {
  const accept = useAcceptInvite();
  const navigate = useNavigate();
  const { register, handleSubmit, setError, formState } = useForm<AcceptInviteInput>({
    resolver: zodResolver(AcceptInviteInputSchema),
    defaultValues: { code, displayName: invite.displayName ?? '', password: '' },
  });
  const onSubmit = handleSubmit((input) =>
    accept.mutateAsync(input).then(
      () => navigate(paths.kitchen, { replace: true }),
      (err) => applyServerErrors(err, setError, ['displayName', 'password']),
    ),
  );
  return (
    <>
      <p className="mt-4 rounded-card border border-hairline bg-surface p-4">
        You are invited to join <span className="font-bold">{invite.businessName}</span> as <span className="font-bold">{ROLE_LABELS[invite.role].toLowerCase()}</span>, signing in as{' '}
        <span className="font-bold">{invite.email}</span>.
      </p>
      <form onSubmit={onSubmit} noValidate className="mt-6 space-y-4">
        <FormError message={formState.errors.root?.server?.message} />
        <input type="text" name="username" autoComplete="username" value={invite.email} readOnly hidden />
        <Field label="Your name" hint="Shown on the records you sign." autoComplete="name" error={formState.errors.displayName?.message} {...register('displayName')} />
        {invite.hasAccount ? (
          <Field label="Your current Crumbtrail password" hint="You already have an account with this e-mail." type="password" autoComplete="current-password" error={formState.errors.password?.message} {...register('password')} />
        ) : (
          <Field
            label="Choose a password"
            hint="At least 8 characters. A short sentence is easy to remember and hard to guess."
            type="password"
            autoComplete="new-password"
            error={formState.errors.password?.message}
            {...register('password')}
          />
        )}
        <Button type="submit" isBusy={accept.isPending} className="w-full">
          Join {invite.businessName}
        </Button>
      </form>
    </>
  );
}

export function Component() {
  const [found, setFound] = useState<{ code: string; invite: InvitePreview } | null>(null);
  return (
    <div>
      <h1 className="text-3xl font-bold">Join a team</h1>
      {found ? <AcceptStep code={found.code} invite={found.invite} /> : <CodeStep onFound={(code, invite) => setFound({ code, invite })} />}
      <p className="mt-6">
        Already on this team? <Link to={paths.signIn}>Sign in</Link>
      </p>
    </div>
  );
}
