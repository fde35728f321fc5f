import { useMutation, useQueryClient } from '@tanstack/react-query';
import { userSchema, type User, type UserUpdateBody } from '#shared/schemas/users.ts';
import { apiRequest } from '../../../lib/api-client.ts';
import { usersKeys } from './get-users.ts';

export interface UpdateUserInput {
  id: number;
  changes: UserUpdateBody;
}

export function updateUser({ id, changes }: UpdateUserInput): Promise<User> {
  return apiRequest(`/users/${id}`, { method: 'PATCH', body: changes, schema: userSchema });
}

/**
 * PATCH one user. A refusal (the last administrator, one's own account) is toasted with the
 * server's message; `errorTitle` says which change failed.
 */
export function useUpdateUser(errorTitle: string | false = 'The user was not changed') {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: updateUser,
    meta: { errorTitle },
    onSettled: () => queryClient.invalidateQueries({ queryKey: usersKeys.all }),
  });
}
