import { useState, type FormEvent } from 'react';
import type { Role } from '#shared/schemas/enums.ts';
import { userCreateBodySchema, type User } from '#shared/schemas/users.ts';
import { Alert } from '../../../components/ui/alert.tsx';
import { Button } from '../../../components/ui/button.tsx';
import { Card } from '../../../components/ui/card.tsx';
import { Input } from '../../../components/ui/input.tsx';
import { Select } from '../../../components/ui/select.tsx';
import { showToast } from '../../../components/ui/toast.tsx';
import { roleOptions } from '../../../config/roles.ts';
import { getErrorMessage, isApiError } from '../../../lib/api-client.ts';
import { fieldErrorsFrom } from '../../../lib/form-errors.ts';
import { useCreateUser } from '../api/create-user.ts';

const empty = { email: '', name: '', role: 'engineer' as Role, password: '' };

export function AddUserForm({ onAdded }: { onAdded?: (user: User) => void }) {
  const createUser = useCreateUser();
  const [values, setValues] = useState(empty);
  const [errors, setErrors] = useState<Record<string, string>>({});
  const set = (field: keyof typeof empty) => (value: string) => setValues((v) => ({ ...v, [field]: value }));

  const submit = (event: FormEvent<HTMLFormElement>) => {
    event.preventDefault();
    const parsed = userCreateBodySchema.safeParse(values);
    if (!parsed.success) {
      setErrors(fieldErrorsFrom(parsed.error.issues));
      return;
    }
    setErrors({});
    createUser.mutate(parsed.data, {
      onSuccess: (user) => {
        setValues(empty);
        showToast({ tone: 'success', title: 'User added', message: `${user.email} can sign in now as ${user.role}.` });
        onAdded?.(user);
      },
      onError: (err) => {
        if (isApiError(err, 409)) setErrors({ email: getErrorMessage(err) });
        else if (isApiError(err, 400)) setErrors(err.fieldErrors());
      },
    });
  };

  // A refusal that no field explains (a lost session, a server fault) is said above the fields.
  const generalError = createUser.isError && !isApiError(createUser.error, 409) && !isApiError(createUser.error, 400);

  return (
    <Card title="Add a user" description="The new user signs in with this e-mail and password; they can be changed later.">
      <form onSubmit={submit} noValidate className="space-y-4">
        {generalError && (
          <Alert tone="error" title="The user was not added">
            {getErrorMessage(createUser.error)}
          </Alert>
        )}
        <div className="grid gap-4 sm:grid-cols-2">
          <Input
            label="E-mail"
            type="email"
            autoComplete="off"
            value={values.email}
            onChange={(e) => set('email')(e.target.value)}
            error={errors.email}
          />
          <Input label="Name" autoComplete="off" value={values.name} onChange={(e) => set('name')(e.target.value)} error={errors.name} />
          <Select label="Role" options={roleOptions} value={values.role} onChange={(e) => set('role')(e.target.value)} error={errors.role} />
          <Input
            label="Password"
            type="password"
            autoComplete="new-password"
            hint="Use 10 characters or more."
            value={values.password}
            onChange={(e) => set('password')(e.target.value)}
            error={errors.password}
          />
        </div>
        <Button type="submit" loading={createUser.isPending}>
          Add user
        </Button>
      </form>
    </Card>
  );
}
