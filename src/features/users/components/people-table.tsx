import { createColumnHelper } from '@tanstack/react-table';
import { useMemo } from 'react';
import { type User } from '@shared/users';
import { formatDate, isoDateTime } from '@/lib/format';
import { Button } from '@/components/button';
import { DataTable } from '@/components/data-table';
import { EmptyState } from '@/components/empty-state';
import { RoleBadges } from '@/components/role-badges';
import { StatusBadge } from '@/components/status-badge';

const column = createColumnHelper<User>();

type PeopleTableProps = {
  users: User[];
  currentUserId: number;
  onChangeRoles: (user: User) => void;
  onSetActive: (user: User) => void;
};

/** Everyone with an account: name, e-mail, roles, status, and the admin's actions on each. */
export function PeopleTable({ users, currentUserId, onChangeRoles, onSetActive }: PeopleTableProps) {
  const columns = useMemo(
    () => [
      column.accessor('name', {
        header: 'Name',
        meta: { rowHeader: true },
        cell: ({ row, getValue }) => (
          <span className="inline-flex flex-wrap items-center gap-1.5">
            <span>{getValue()}</span>
            {row.original.id === currentUserId ? <span className="text-xs font-normal text-ink-soft">(you)</span> : null}
          </span>
        ),
      }),
      column.accessor('email', { header: 'E-mail', meta: { cellClassName: 'whitespace-nowrap' } }),
      column.accessor((user) => user.roles.length, {
        id: 'roles',
        header: 'Roles',
        enableSorting: false,
        cell: ({ row }) => <RoleBadges roles={row.original.roles} />,
      }),
      column.accessor('active', {
        header: 'Status',
        sortingFn: 'basic',
        cell: ({ getValue }) => (getValue() ? <StatusBadge tone="good">Active</StatusBadge> : <StatusBadge tone="neutral">Inactive</StatusBadge>),
      }),
      column.accessor('createdAt', {
        header: 'Added',
        meta: { numeric: true },
        cell: ({ getValue }) => <time dateTime={isoDateTime(getValue())}>{formatDate(getValue())}</time>,
      }),
      column.display({
        id: 'actions',
        header: () => <span className="sr-only">Actions</span>,
        meta: { cellClassName: 'text-right whitespace-nowrap', headerClassName: 'text-right' },
        cell: ({ row }) => {
          const user = row.original;
          const self = user.id === currentUserId;
          return (
            <div className="flex justify-end gap-1.5">
              <Button size="sm" variant="ghost" onClick={() => onChangeRoles(user)} aria-label={`Change roles of ${user.name}`}>
                Roles…
              </Button>
              <Button
                size="sm"
                variant="ghost"
                onClick={() => onSetActive(user)}
                disabled={self && user.active}
                title={self && user.active ? 'You cannot deactivate your own account.' : undefined}
                aria-label={`${user.active ? 'Deactivate' : 'Reactivate'} ${user.name}`}
              >
                {user.active ? 'Deactivate…' : 'Reactivate…'}
              </Button>
            </div>
          );
        },
      }),
    ],
    [currentUserId, onChangeRoles, onSetActive],
  );

  return (
    <DataTable
      data={users}
      columns={columns}
      caption="People with a Scorecourt account"
      getRowId={(user) => String(user.id)}
      initialSorting={[{ id: 'name', desc: false }]}
      pagination={{ pageSize: 50 }}
      empty={<EmptyState title="No one here yet">Invite the first person with the button above.</EmptyState>}
    />
  );
}
