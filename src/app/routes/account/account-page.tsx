import { useMemo } from 'react';
import type { z } from 'zod';
import { useForm } from 'react-hook-form';
import { zodResolver } from '@hookform/resolvers/zod';
import { useQuery, type QueryClient } from '@tanstack/react-query';
import { ChangePasswordInputSchema, type ChangePasswordInput } from '@shared/contracts/auth';
import { UpdateProfileInputSchema, type SessionSummary, type UpdateProfileInput } from '@shared/contracts/account';
import { accountQueries, useChangePassword, useEndSession, useUpdateProfile } from '@/features/account/api';
import { useSession } from '@/features/auth/api';
import { applyServerErrors } from '@/lib/form-errors';
import { PageHeader } from '@/components/ui/page-header';
import { Field, FormError } from '@/components/ui/field';
import { Checkbox } from '@/components/ui/checkbox';
import { Button } from '@/components/ui/button';
import { DataTable, type ColumnDef } from '@/components/ui/data-table';
import { LoadingBlock } from '@/components/ui/spinner';
import { useToast } from '@/components/ui/toast';
import { ROLE_LABELS } from '../../nav';

export { RouteErrorBoundary as ErrorBoundary } from '../../route-error';

export const loader = (qc: QueryClient) => async () => {
  await qc.ensureQueryData(accountQueries.sessions());
  return null;
};

/** "Chrome on Linux" from a user-agent string; the raw string means little to people. */
function browserName(ua: string): string {
  const browser = /Edg\//.test(ua) ? 'Edge' : /Firefox\//.test(ua) ? 'Firefox' : /Chrome\//.test(ua) ? 'Chrome' : /Safari\//.test(ua) ? 'Safari' : null;
  const os = /iPhone|iPad/.test(ua) ? 'iPhone or iPad' : /Android/.test(ua) ? 'Android' : /Windows/.test(ua) ? 'Windows' : /Mac OS X/.test(ua) ? 'Mac' : /Linux/.test(ua) ? 'Linux' : null;
  return browser && os ? `${browser} on ${os}` : browser ?? os ?? ua;
}

const dateTime = (iso: string) => new Date(iso).toLocaleString(undefined, { dateStyle: 'medium', timeStyle: 'short' });

function Card({ id, title, children }: { id: string; title: string; children: React.ReactNode }) {
  return (
    <section aria-labelledby={id} className="rounded-card border border-hairline bg-surface p-4 sm:p-6">
      <h2 id={id} className="text-xl font-bold">
        {title}
      </h2>
      <div className="mt-4">{children}</div>
    </section>
  );
}

function ProfileForm() {
  const session = useSession();
  const update = useUpdateProfile();
  const { showToast } = useToast();
  const { register, handleSubmit, setError, formState } = useForm<UpdateProfileInput>({
    resolver: zodResolver(UpdateProfileInputSchema),
    defaultValues: { displayName: session.user?.displayName ?? '' },
  });
  const onSubmit = handleSubmit((input) =>
    update.mutateAsync(input).then(
      () => showToast('Your name is saved.'),
      (err) => applyServerErrors(err, setError, ['displayName']),
    ),
  );
  return (
    <form onSubmit={onSubmit} noValidate className="max-w-md space-y-4">
      <FormError message={formState.errors.root?.server?.message} />
      <p>
        <span className="font-bold">E-mail:</span> {session.user?.email} · <span className="font-bold">Role:</span> {session.user ? ROLE_LABELS[session.user.role] : ''}
      </p>
      <Field label="Your name" hint="Shown on the records you sign." autoComplete="name" error={formState.errors.displayName?.message} {...register('displayName')} />
      <Button type="submit" isBusy={update.isPending}>
        Save name
      </Button>
    </form>
  );
}

function PasswordForm() {
  const session = useSession();
  const change = useChangePassword();
  const { showToast } = useToast();
  const { register, handleSubmit, setError, reset, formState } = useForm<z.input<typeof ChangePasswordInputSchema>, unknown, ChangePasswordInput>({
    resolver: zodResolver(ChangePasswordInputSchema),
    defaultValues: { currentPassword: '', newPassword: '', endOtherSessions: true },
  });
  const onSubmit = handleSubmit((input) =>
    change.mutateAsync(input).then(
      (res) => {
        reset();
        showToast(res.endedSessions > 0 ? `Password changed. ${res.endedSessions} other ${res.endedSessions === 1 ? 'session was' : 'sessions were'} ended.` : 'Password changed.');
      },
      (err) => applyServerErrors(err, setError, ['currentPassword', 'newPassword', 'endOtherSessions']),
    ),
  );
  return (
    <form onSubmit={onSubmit} noValidate className="max-w-md space-y-4">
      <FormError message={formState.errors.root?.server?.message} />
      {/* Lets password managers pair the new password with this account. */}
      <input type="text" name="username" autoComplete="username" value={session.user?.email ?? ''} readOnly hidden />
      <Field label="Current password" type="password" autoComplete="current-password" error={formState.errors.currentPassword?.message} {...register('currentPassword')} />
      <Field
        label="New password"
        type="password"
        autoComplete="new-password"
        hint="At least 8 characters. A short sentence is easy to remember and hard to guess."
        error={formState.errors.newPassword?.message}
        {...register('newPassword')}
      />
      <Checkbox label="End my other sessions" hint="Signs you out on every other browser and device. Keep this on if you think someone else knows your password." {...register('endOtherSessions')} />
      <Button type="submit" isBusy={change.isPending}>
        Change password
      </Button>
    </form>
  );
}

function SessionsTable() {
  const sessions = useQuery(accountQueries.sessions());
  const end = useEndSession();
  const { showToast } = useToast();
  const columns = useMemo<ColumnDef<SessionSummary, unknown>[]>(
    () => [
      { id: 'userAgent', header: 'Browser or device', accessorFn: (s) => (s.isCurrent ? `This browser${s.userAgent ? ` (${browserName(s.userAgent)})` : ''}` : (s.userAgent ? browserName(s.userAgent) : 'Unknown browser')) },
      { id: 'createdAt', header: 'Signed in', accessorKey: 'createdAt', cell: (c) => <span className="tabular">{dateTime(c.row.original.createdAt)}</span> },
      { id: 'lastSeenAt', header: 'Last active', accessorKey: 'lastSeenAt', cell: (c) => <span className="tabular">{dateTime(c.row.original.lastSeenAt)}</span> },
      {
        id: 'actions',
        header: 'Actions',
        enableSorting: false,
        cell: (c) =>
          c.row.original.isCurrent ? (
            <span className="text-muted">Current session</span>
          ) : (
            <Button variant="secondary" className="whitespace-nowrap" isBusy={end.isPending && end.variables === c.row.original.id} onClick={() => end.mutate(c.row.original.id, { onSuccess: () => showToast('That session has ended.') })}>
              End session
            </Button>
          ),
      },
    ],
    [end, showToast],
  );
  if (sessions.isPending) return <LoadingBlock label="Loading your sessions…" />;
  if (!sessions.data) return null;
  return <DataTable caption="Where you are signed in" isCaptionHidden columns={columns} data={sessions.data.sessions} getRowId={(s) => s.id} initialSorting={[{ id: 'lastSeenAt', desc: true }]} />;
}

export function Component() {
  return (
    <>
      <PageHeader title="Account" description="Your name, your password and where you are signed in." />
      <div className="space-y-8">
        <Card id="profile-heading" title="Your details">
          <ProfileForm />
        </Card>
        <Card id="password-heading" title="Change password">
          <PasswordForm />
        </Card>
        <Card id="sessions-heading" title="Where you are signed in">
          <SessionsTable />
        </Card>
      </div>
    </>
  );
}
