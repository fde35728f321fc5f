import type { Role } from '#shared/schemas/enums.ts';
import type { User } from '#shared/schemas/users.ts';
import { Badge } from '../../../components/ui/badge.tsx';
import { Button } from '../../../components/ui/button.tsx';
import { Checkbox } from '../../../components/ui/checkbox.tsx';
import { Select } from '../../../components/ui/select.tsx';
import { showToast } from '../../../components/ui/toast.tsx';
import { Table, type Column } from '../../../components/ui/table.tsx';
import { roleLabels, roleOptions } from '../../../config/roles.ts';
import { formatDateTime } from '../../../lib/format.ts';
import { useUpdateUser } from '../api/update-user.ts';

interface UsersTableProps {
  users: readonly User[];
  /** The signed-in administrator: their own row offers no "Disable". */
  currentUserId: number;
  onSetPassword: (user: User) => void;
  onChanged?: (user: User) => void;
}

function RoleCell({ user, onChanged }: { user: User; onChanged?: (user: User) => void }) {
  const update = useUpdateUser('The role was not changed');
  // While the change is on its way show the chosen role; after a refusal the server's role returns.
  const shown = (update.isPending && update.variables?.changes.role) || user.role;
  return (
    <Select
      label={`Role of ${user.email}`}
      hideLabel
      options={roleOptions}
      value={shown}
      disabled={update.isPending}
      compact
      className="min-w-36"
      onChange={(e) =>
        update.mutate(
          { id: user.id, changes: { role: e.target.value as Role } },
          {
            onSuccess: (changed) => {
              showToast({ tone: 'success', title: 'Role changed', message: `${changed.email} is now ${roleLabels[changed.role]}.` });
              onChanged?.(changed);
            },
          },
        )
      }
    />
  );
}

function DigestCell({ user, onChanged }: { user: User; onChanged?: (user: User) => void }) {
  const update = useUpdateUser('The subscription was not changed');
  const checked = update.isPending ? Boolean(update.variables?.changes.digest) : user.digest;
  return (
    <Checkbox
      label={`Nightly digest for ${user.email}`}
      className="[&_label]:sr-only"
      checked={checked}
      disabled={update.isPending}
      onChange={(e) =>
        update.mutate(
          { id: user.id, changes: { digest: e.target.checked } },
          {
            onSuccess: (changed) => {
              showToast({ tone: 'success', title: changed.digest ? 'Subscribed' : 'Unsubscribed', message: `${changed.email} ${changed.digest ? 'gets' : 'no longer gets'} the nightly digest.` });
              onChanged?.(changed);
            },
          },
        )
      }
    />
  );
}

function DisableButton({ user, onChanged }: { user: User; onChanged?: (user: User) => void }) {
  const update = useUpdateUser(user.disabled ? 'The account was not enabled' : 'The account was not disabled');
  return (
    <Button
      variant={user.disabled ? 'secondary' : 'ghost'}
      size="sm"
      loading={update.isPending}
      aria-label={`${user.disabled ? 'Enable' : 'Disable'} ${user.email}`}
      onClick={() =>
        update.mutate(
          { id: user.id, changes: { disabled: !user.disabled } },
          {
            onSuccess: (changed) => {
              showToast({
                tone: 'success',
                title: changed.disabled ? 'Account disabled' : 'Account enabled',
                message: changed.disabled ? `${changed.email} can no longer sign in.` : `${changed.email} can sign in again.`,
              });
              onChanged?.(changed);
            },
          },
        )
      }
    >
      {user.disabled ? 'Enable' : 'Disable'}
    </Button>
  );
}

export function UsersTable({ users, currentUserId, onSetPassword, onChanged }: UsersTableProps) {
  const columns: Column<User>[] = [
    {
      id: 'email',
      header: 'E-mail',
      sortValue: (u) => u.email,
      cell: (u) => (
        <span className="flex items-center gap-2 text-basin-900">
          {u.email}
          {u.id === currentUserId && <Badge tone="brand">you</Badge>}
        </span>
      ),
    },
    { id: 'name', header: 'Name', sortValue: (u) => u.name || null, cell: (u) => (u.name ? <span className="whitespace-nowrap">{u.name}</span> : <span className="text-basin-600">—</span>) },
    { id: 'role', header: 'Role', sortValue: (u) => roleLabels[u.role], cell: (u) => <RoleCell user={u} onChanged={onChanged} /> },
    {
      id: 'status',
      header: 'Status',
      sortValue: (u) => (u.disabled ? 1 : 0),
      cell: (u) => (u.disabled ? <Badge tone="fault">Disabled</Badge> : <Badge tone="ok">Active</Badge>),
    },
    { id: 'digest', header: 'Digest', sortValue: (u) => (u.digest ? 0 : 1), cell: (u) => <DigestCell user={u} onChanged={onChanged} /> },
    {
      id: 'lastLogin',
      header: 'Last sign-in',
      sortValue: (u) => u.lastLoginAt,
      cell: (u) => <span className="whitespace-nowrap text-basin-700">{u.lastLoginAt ? formatDateTime(u.lastLoginAt) : 'never'}</span>,
    },
    {
      id: 'actions',
      header: 'Actions',
      cell: (u) => (
        <div className="flex items-center gap-1">
          <Button variant="ghost" size="sm" aria-label={`Set a new password for ${u.email}`} onClick={() => onSetPassword(u)}>
            Set password
          </Button>
          {u.id !== currentUserId && <DisableButton user={u} onChanged={onChanged} />}
        </div>
      ),
    },
  ];
  return (
    <Table
      caption={`${users.length} ${users.length === 1 ? 'user' : 'users'}`}
      columns={columns}
      rows={users}
      rowKey={(u) => u.id}
      initialSort={{ id: 'email', direction: 'ascending' }}
      dense
    />
  );
}
