import { type QueryClient, useSuspenseQuery } from '@tanstack/react-query';
import { useCallback, useState } from 'react';
import { type LoaderFunctionArgs } from 'react-router';
import { type User } from '@shared/users';
import { useUser } from '@/lib/auth';
import { Button } from '@/components/button';
import { Alert } from '@/components/callout';
import { DocumentTitle } from '@/components/document-title';
import { PageHeader } from '@/components/page-header';
import { usersQueryOptions } from '@/features/users/api/get-users';
import { ChangeRolesDialog } from '@/features/users/components/change-roles-dialog';
import { InvitePersonDialog } from '@/features/users/components/invite-person-dialog';
import { PeopleTable } from '@/features/users/components/people-table';
import { SetActiveDialog } from '@/features/users/components/set-active-dialog';
import { requireRole } from '@/app/guards';

export const loader = (queryClient: QueryClient) => async ({ request }: LoaderFunctionArgs) => {
  await requireRole(queryClient, request, 'People', 'admin');
  await queryClient.ensureQueryData(usersQueryOptions());
  return null;
};

type Open = { kind: 'invite' } | { kind: 'roles'; user: User } | { kind: 'active'; user: User } | null;

export function Component() {
  const { data: me } = useUser();
  // The loader filled the cache; a failed load shows the route's error boundary.
  const users = useSuspenseQuery(usersQueryOptions());
  const [open, setOpen] = useState<Open>(null);
  const [notice, setNotice] = useState<string | null>(null);

  const close = useCallback(() => setOpen(null), []);
  const onChangeRoles = useCallback((user: User) => setOpen({ kind: 'roles', user }), []);
  const onSetActive = useCallback((user: User) => setOpen({ kind: 'active', user }), []);
  const done = (message: string) => {
    setOpen(null);
    setNotice(message);
  };

  if (!me) return null;
  const activeCount = users.data.filter((user) => user.active).length;

  return (
    <>
      <DocumentTitle>People</DocumentTitle>
      <PageHeader
        eyebrow="Administration"
        title="People"
        subtitle={`${users.data.length} ${users.data.length === 1 ? 'account' : 'accounts'}, ${activeCount} active. Invited people stay inactive until they choose a password with their link.`}
        actions={
          <Button variant="primary" onClick={() => setOpen({ kind: 'invite' })}>
            Invite a person
          </Button>
        }
      />
      <div className="space-y-4">
        {notice ? (
          <Alert tone="success" onDismiss={() => setNotice(null)}>
            <p>{notice}</p>
          </Alert>
        ) : null}
        <PeopleTable users={users.data} currentUserId={me.id} onChangeRoles={onChangeRoles} onSetActive={onSetActive} />
      </div>
      <InvitePersonDialog
        open={open?.kind === 'invite'}
        onClose={close}
        onInvited={(user) => done(`Invitation sent to ${user.email}. ${user.name} appears as inactive until they choose a password.`)}
      />
      <ChangeRolesDialog
        user={open?.kind === 'roles' ? open.user : null}
        currentUserId={me.id}
        onClose={close}
        onSaved={(user) => done(`Roles of ${user.name} saved.`)}
      />
      <SetActiveDialog
        user={open?.kind === 'active' ? open.user : null}
        onClose={close}
        onSaved={(user) => done(user.active ? `${user.name} can sign in again.` : `${user.name} is deactivated and has been signed out.`)}
      />
    </>
  );
}
