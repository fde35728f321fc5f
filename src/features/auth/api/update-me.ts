import { useMutation, useQueryClient } from '@tanstack/react-query';
import { meSchema, type MeUpdateBody, type User } from '#shared/schemas/users.ts';
import { apiRequest } from '../../../lib/api-client.ts';
import { authKeys } from './get-me.ts';

/** PATCH /api/auth/me: what anyone may change of their own account (the digest subscription). */
export async function updateMe(changes: MeUpdateBody): Promise<User> {
  const { user } = await apiRequest('/auth/me', { method: 'PATCH', body: changes, schema: meSchema });
  return user;
}

export function useUpdateMe() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: updateMe,
    meta: { errorTitle: 'The subscription was not changed' },
    onSuccess: (user) => queryClient.setQueryData(authKeys.me(), user),
  });
}
