import { useMutation, useQueryClient } from '@tanstack/react-query';
import { userSchema, type User, type UserCreateBody } from '#shared/schemas/users.ts';
import { apiRequest } from '../../../lib/api-client.ts';
import { usersKeys } from './get-users.ts';

export function createUser(body: UserCreateBody): Promise<User> {
  return apiRequest('/users', { method: 'POST', body, schema: userSchema });
}

export function useCreateUser() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: createUser,
    // The form shows a refusal (e-mail taken, bad field) next to its fields.
    meta: { errorTitle: false },
    onSuccess: () => queryClient.invalidateQueries({ queryKey: usersKeys.all }),
  });
}
