import { useState } from 'react';
import type { User } from '#shared/schemas/users.ts';
import { useUsers } from '../api/get-users.ts';
import { AddUserForm } from './add-user-form.tsx';
import { SetPasswordForm } from './set-password-form.tsx';
import { UsersTable } from './users-table.tsx';

export interface UsersPanelProps {
  currentUserId: number;
  /** Called after any change to a user, with the user as the server now has it. */
  onChanged?: (user: User) => void;
}

/** Everything an administrator does with accounts: list, add, change role, disable, set a password. */
export function UsersPanel({ currentUserId, onChanged }: UsersPanelProps) {
  const users = useUsers();
  const [passwordFor, setPasswordFor] = useState<User | null>(null);
  return (
    <div className="space-y-6">
      <UsersTable users={users} currentUserId={currentUserId} onSetPassword={setPasswordFor} onChanged={onChanged} />
      {passwordFor && <SetPasswordForm key={passwordFor.id} user={passwordFor} onDone={() => setPasswordFor(null)} />}
      <AddUserForm onAdded={onChanged} />
    </div>
  );
}
