import { useState, type FormEvent } from 'react';
import { loginBodySchema, type User } from '#shared/schemas/users.ts';
import { Alert } from '../../../components/ui/alert.tsx';
import { Button } from '../../../components/ui/button.tsx';
import { Input } from '../../../components/ui/input.tsx';
import { getErrorMessage } from '../../../lib/api-client.ts';
import { useSignIn } from '../api/sign-in.ts';

type Field = 'email' | 'password';

export function SignInForm({ onSignedIn }: { onSignedIn: (user: User) => void }) {
  const signIn = useSignIn();
  const [email, setEmail] = useState('');
  const [password, setPassword] = useState('');
  const [fieldErrors, setFieldErrors] = useState<Partial<Record<Field, string>>>({});

  const submit = (event: FormEvent<HTMLFormElement>) => {
    event.preventDefault();
    const parsed = loginBodySchema.safeParse({ email, password });
    if (!parsed.success) {
      const errors: Partial<Record<Field, string>> = {};
      for (const issue of parsed.error.issues) {
        const field = issue.path[0];
        if ((field === 'email' || field === 'password') && !errors[field]) {
          errors[field] = field === 'email' ? 'Enter your e-mail address, such as name@plant.example.' : 'Enter your password.';
        }
      }
      setFieldErrors(errors);
      return;
    }
    setFieldErrors({});
    signIn.mutate(parsed.data, { onSuccess: onSignedIn });
  };

  return (
    <form onSubmit={submit} noValidate className="space-y-4">
      {signIn.isError && (
        <Alert tone="error" title="Not signed in">
          {getErrorMessage(signIn.error)}
        </Alert>
      )}
      <Input
        label="E-mail"
        type="email"
        name="email"
        autoComplete="username"
        required
        value={email}
        onChange={(e) => setEmail(e.target.value)}
        error={fieldErrors.email}
      />
      <Input
        label="Password"
        type="password"
        name="password"
        autoComplete="current-password"
        required
        value={password}
        onChange={(e) => setPassword(e.target.value)}
        error={fieldErrors.password}
      />
      <Button type="submit" className="w-full" loading={signIn.isPending}>
        Sign in
      </Button>
    </form>
  );
}
