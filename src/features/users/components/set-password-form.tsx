import { useState, type FormEvent } from 'react';
import { passwordSchema, type User } from '#shared/schemas/users.ts';
import { Alert } from '../../../components/ui/alert.tsx';
import { Button } from '../../../components/ui/button.tsx';
import { Card } from '../../../components/ui/card.tsx';
import { Input } from '../../../components/ui/input.tsx';
import { showToast } from '../../../components/ui/toast.tsx';
import { getErrorMessage } from '../../../lib/api-client.ts';
import { fieldErrorsFrom } from '../../../lib/form-errors.ts';
import { useUpdateUser } from '../api/update-user.ts';

export function SetPasswordForm({ user, onDone }: { user: User; onDone: () => void }) {
  const updateUser = useUpdateUser(false);
  const [password, setPassword] = useState('');
  const [error, setError] = useState<string>();

  const submit = (event: FormEvent<HTMLFormElement>) => {
    event.preventDefault();
    const parsed = passwordSchema.safeParse(password);
    if (!parsed.success) {
      setError(fieldErrorsFrom(parsed.error.issues.map((i) => ({ ...i, path: ['password'] }))).password);
      return;
    }
    setError(undefined);
    updateUser.mutate(
      { id: user.id, changes: { password: parsed.data } },
      {
        onSuccess: () => {
          showToast({ tone: 'success', title: 'Password changed', message: `${user.email} signs in with the new password from now on.` });
          onDone();
        },
      },
    );
  };

  return (
    <Card title={`New password for ${user.email}`} description="Tell the user the new password in person or by another safe channel.">
      <form onSubmit={submit} noValidate className="space-y-4">
        {updateUser.isError && (
          <Alert tone="error" title="The password was not changed">
            {getErrorMessage(updateUser.error)}
          </Alert>
        )}
        <Input
          label="New password"
          type="password"
          autoComplete="new-password"
          hint="Use 10 characters or more."
          className="max-w-sm"
          autoFocus
          value={password}
          onChange={(e) => setPassword(e.target.value)}
          error={error}
        />
        <div className="flex gap-2">
          <Button type="submit" loading={updateUser.isPending}>
            Save password
          </Button>
          <Button variant="secondary" onClick={onDone}>
            Cancel
          </Button>
        </div>
      </form>
    </Card>
  );
}
