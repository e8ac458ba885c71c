import { useMemo, useState } from 'react';
import { useForm } from 'react-hook-form';
import { zodResolver } from '@hookform/resolvers/zod';
import { useQuery, type QueryClient } from '@tanstack/react-query';
import { ROLES, type Role } from '@shared/contracts/auth';
import { CreateInviteInputSchema, type CreatedInvite, type CreateInviteInput, type Invite, type Member } from '@shared/contracts/team';
import { teamQueries, useChangeMemberRole, useCreateInvite, useRevokeInvite, useSetMemberActive } from '@/features/team/api';
import { sessionQueries, useSession } from '@/features/auth/api';
import { applyServerErrors } from '@/lib/form-errors';
import { clearDraft, useFormDraft } from '@/lib/form-drafts';
import { isApiError } from '@/lib/api-client';
import { PageHeader } from '@/components/ui/page-header';
import { Field, FormError } from '@/components/ui/field';
import { Select } from '@/components/ui/select';
import { Button } from '@/components/ui/button';
import { DataTable, type ColumnDef } from '@/components/ui/data-table';
import { Dialog } from '@/components/ui/dialog';
import { LoadingBlock } from '@/components/ui/spinner';
import { useToast } from '@/components/ui/toast';
import { ROLE_LABELS } from '../../nav';

export { RouteErrorBoundary as ErrorBoundary } from '../../route-error';

export const loader = (qc: QueryClient) => async () => {
  // Others see "not available for your role"; asking for the invites would only answer 403.
  const session = await qc.ensureQueryData(sessionQueries.current());
  if (session.user?.role !== 'owner') return null;
  await Promise.all([qc.ensureQueryData(teamQueries.members()), qc.ensureQueryData(teamQueries.invites())]);
  return null;
};

const ROLE_OPTIONS = ROLES.map((r) => ({ value: r, label: ROLE_LABELS[r] }));
const ROLE_HINT = 'Owners manage the team and records; bakers run production; helpers work the kitchen board and cleaning.';
const INVITE_FORM = 'team-invite';

const dateTime = (iso: string) => new Date(iso).toLocaleString(undefined, { dateStyle: 'medium', timeStyle: 'short' });

function InviteForm({ onCreated }: { onCreated: (created: CreatedInvite) => void }) {
  const create = useCreateInvite();
  const form = useForm<CreateInviteInput>({ resolver: zodResolver(CreateInviteInputSchema), defaultValues: { email: '', role: 'helper', displayName: undefined } });
  const { register, handleSubmit, setError, reset, formState } = form;
  useFormDraft(INVITE_FORM, form);
  const onSubmit = handleSubmit((input) =>
    create.mutateAsync({ ...input, displayName: input.displayName || undefined }).then(
      (created) => {
        clearDraft(INVITE_FORM);
        reset();
        onCreated(created);
      },
      (err) => applyServerErrors(err, setError, ['email', 'role', 'displayName']),
    ),
  );
  return (
    <section aria-labelledby="invite-heading" className="rounded-card border border-hairline bg-surface p-4 sm:p-6">
      <h2 id="invite-heading" className="text-xl font-bold">
        Invite someone
      </h2>
      <form onSubmit={onSubmit} noValidate className="mt-4 grid gap-4 md:grid-cols-2">
        <div className="md:col-span-2">
          <FormError message={formState.errors.root?.server?.message} />
        </div>
        <Field label="E-mail" type="email" autoComplete="off" error={formState.errors.email?.message} {...register('email')} />
        <Field label="Name" isOptional autoComplete="off" error={formState.errors.displayName?.message} {...register('displayName', { setValueAs: (v: string) => v || undefined })} />
        <Select label="Role" hint={ROLE_HINT} options={ROLE_OPTIONS} error={formState.errors.role?.message} {...register('role')} />
        <div className="flex items-end">
          <Button type="submit" isBusy={create.isPending}>
            Create invite
          </Button>
        </div>
      </form>
    </section>
  );
}

function MemberRoleForm({ member, isSelf }: { member: Member; isSelf: boolean }) {
  const change = useChangeMemberRole();
  const { showToast } = useToast();
  const [role, setRole] = useState<Role>(member.role);
  const error = change.error && isApiError(change.error) ? change.error.message : undefined;
  const errorId = `role-error-${member.userId}`;
  return (
    <form
      className="flex flex-wrap items-center gap-2"
      onSubmit={(e) => {
        e.preventDefault();
        change.mutate({ userId: member.userId, role }, { onSuccess: () => showToast(`${member.displayName} is now ${ROLE_LABELS[role].toLowerCase()}.`) });
      }}
    >
      <label className="sr-only" htmlFor={`role-${member.userId}`}>
        Role for {member.displayName}
      </label>
      <select
        id={`role-${member.userId}`}
        value={role}
        onChange={(e) => setRole(e.target.value as Role)}
        aria-describedby={error ? errorId : undefined}
        className="min-h-10 rounded-control border border-edge bg-surface px-2"
        disabled={member.isActive === false}
      >
        {ROLE_OPTIONS.map((o) => (
          <option key={o.value} value={o.value}>
            {o.label}
          </option>
        ))}
      </select>
      <Button type="submit" variant="secondary" isBusy={change.isPending} disabled={role === member.role}>
        Change role<span className="sr-only"> for {member.displayName}</span>
      </Button>
      {isSelf ? <span className="text-sm text-muted">(you)</span> : null}
      {error ? (
        <p id={errorId} role="alert" className="w-full text-sm font-bold text-cherry">
          {error}
        </p>
      ) : null}
    </form>
  );
}

function MemberAccessButton({ member, onAsk }: { member: Member; onAsk: (m: Member) => void }) {
  const setActive = useSetMemberActive();
  const { showToast } = useToast();
  if (member.isActive === false) {
    return (
      <Button variant="secondary" isBusy={setActive.isPending} onClick={() => setActive.mutate({ userId: member.userId, isActive: true }, { onSuccess: () => showToast(`${member.displayName} can sign in again.`) })}>
        Turn access back on<span className="sr-only"> for {member.displayName}</span>
      </Button>
    );
  }
  return (
    <Button variant="secondary" onClick={() => onAsk(member)}>
      Turn off access<span className="sr-only"> for {member.displayName}</span>
    </Button>
  );
}

function DisableDialog({ member, onClose }: { member: Member | null; onClose: () => void }) {
  const setActive = useSetMemberActive();
  const { showToast } = useToast();
  const error = setActive.error && isApiError(setActive.error) ? setActive.error.message : undefined;
  return (
    <Dialog
      isOpen={member !== null}
      onClose={() => {
        setActive.reset();
        onClose();
      }}
      isAlert
      title={member ? `Turn off access for ${member.displayName}?` : 'Turn off access?'}
      description={<p>They are signed out everywhere at once and cannot sign in. Their past records stay as they are, with their name. You can turn access back on later.</p>}
      actions={
        <>
          <Button variant="secondary" data-autofocus onClick={onClose}>
            Keep access
          </Button>
          <Button
            variant="danger"
            isBusy={setActive.isPending}
            onClick={() =>
              member &&
              setActive.mutate(
                { userId: member.userId, isActive: false },
                {
                  onSuccess: () => {
                    showToast(`${member.displayName} can no longer sign in.`);
                    onClose();
                  },
                },
              )
            }
          >
            Turn off access
          </Button>
        </>
      }
    >
      {error ? (
        <p role="alert" className="font-bold text-cherry">
          {error}
        </p>
      ) : null}
    </Dialog>
  );
}

function InvitesTable({ invites }: { invites: Invite[] }) {
  const revoke = useRevokeInvite();
  const { showToast } = useToast();
  const columns = useMemo<ColumnDef<Invite, unknown>[]>(
    () => [
      { id: 'email', header: 'E-mail', accessorKey: 'email' },
      { id: 'role', header: 'Role', accessorFn: (i) => ROLE_LABELS[i.role] },
      { id: 'invitedBy', header: 'Invited by', accessorKey: 'invitedBy' },
      { id: 'expiresAt', header: 'Expires', accessorKey: 'expiresAt', cell: (c) => <span className="tabular">{dateTime(c.row.original.expiresAt)}</span> },
      {
        id: 'actions',
        header: 'Actions',
        enableSorting: false,
        cell: (c) => (
          <Button variant="secondary" isBusy={revoke.isPending && revoke.variables === c.row.original.id} onClick={() => revoke.mutate(c.row.original.id, { onSuccess: () => showToast(`Invite for ${c.row.original.email} withdrawn.`) })}>
            Withdraw<span className="sr-only"> invite for {c.row.original.email}</span>
          </Button>
        ),
      },
    ],
    [revoke, showToast],
  );
  return <DataTable caption="Invites waiting to be accepted" columns={columns} data={invites} getRowId={(i) => i.id} emptyMessage="No invites are waiting." />;
}

export function Component() {
  const session = useSession();
  const members = useQuery(teamQueries.members());
  const invites = useQuery(teamQueries.invites());
  const [created, setCreated] = useState<CreatedInvite | null>(null);
  const [toDisable, setToDisable] = useState<Member | null>(null);
  const { showToast } = useToast();

  const columns = useMemo<ColumnDef<Member, unknown>[]>(
    () => [
      { id: 'displayName', header: 'Name', accessorKey: 'displayName' },
      { id: 'email', header: 'E-mail', accessorFn: (m) => m.email ?? '' },
      { id: 'status', header: 'Access', accessorFn: (m) => (m.isActive === false ? 'Turned off' : 'Active') },
      { id: 'role', header: 'Role', accessorFn: (m) => ROLE_LABELS[m.role], cell: (c) => <MemberRoleForm member={c.row.original} isSelf={c.row.original.userId === session.user?.id} /> },
      {
        id: 'actions',
        header: 'Actions',
        enableSorting: false,
        cell: (c) => (c.row.original.userId === session.user?.id ? null : <MemberAccessButton member={c.row.original} onAsk={setToDisable} />),
      },
    ],
    [session.user?.id],
  );

  return (
    <>
      <PageHeader title="Team" description="Invite people, set what each person may do, and turn off access when someone leaves." />
      <div className="space-y-8">
        <InviteForm
          onCreated={(c) => {
            setCreated(c);
            showToast(`Invite created for ${c.invite.email}.`);
          }}
        />
        {members.isPending ? <LoadingBlock label="Loading the team…" /> : members.data ? <DataTable caption="Team members" columns={columns} data={members.data.members} getRowId={(m) => m.userId} searchLabel="Search the team" initialSorting={[{ id: 'displayName', desc: false }]} /> : null}
        {invites.data ? <InvitesTable invites={invites.data.invites} /> : null}
      </div>
      <Dialog
        isOpen={created !== null}
        onClose={() => setCreated(null)}
        title="Give them this invite code"
        description={
          created ? (
            <p>
              {created.invite.displayName ?? created.invite.email} joins as {ROLE_LABELS[created.invite.role].toLowerCase()} by opening Crumbtrail, choosing “Use your invite code” on the sign-in page, and entering this code. It works once and
              expires {dateTime(created.invite.expiresAt)}. It is shown only now.
            </p>
          ) : null
        }
        actions={
          <Button data-autofocus onClick={() => setCreated(null)}>
            Done
          </Button>
        }
      >
        {created ? (
          <>
            <p className="text-sm font-bold">Invite code</p>
            <p className="mt-1 rounded-control border border-edge bg-flour p-3 text-center text-xl font-bold tracking-wide break-all tabular">{created.code}</p>
          </>
        ) : null}
      </Dialog>
      <DisableDialog member={toDisable} onClose={() => setToDisable(null)} />
    </>
  );
}
