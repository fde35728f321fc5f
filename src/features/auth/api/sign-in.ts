import { useMutation, useQueryClient } from '@tanstack/react-query';
import { meSchema, type LoginBody, type User } from '#shared/schemas/users.ts';
import { apiRequest } from '../../../lib/api-client.ts';
import { authKeys } from './get-me.ts';

export async function signIn(body: LoginBody): Promise<User> {
  const { user } = await apiRequest('/auth/login', { method: 'POST', body, schema: meSchema });
  return user;
}

export function useSignIn() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: signIn,
    // The form shows the server's message (wrong password, too many attempts) beside the fields.
    meta: { errorTitle: false },
    onSuccess: (user) => {
      // Whatever another user left in the cache is not this user's to see.
      queryClient.removeQueries({ predicate: (q) => q.queryKey[0] !== authKeys.all[0] });
      queryClient.setQueryData(authKeys.me(), user);
    },
  });
}
