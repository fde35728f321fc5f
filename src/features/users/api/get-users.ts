import { queryOptions, useSuspenseQuery } from '@tanstack/react-query';
import { userListSchema, type User } from '#shared/schemas/users.ts';
import { apiRequest } from '../../../lib/api-client.ts';

export const usersKeys = {
  all: ['users'] as const,
  list: () => [...usersKeys.all, 'list'] as const,
};

export async function getUsers(signal?: AbortSignal): Promise<User[]> {
  const { users } = await apiRequest('/users', { schema: userListSchema, signal });
  return users;
}

export const usersQueryOptions = queryOptions({
  queryKey: usersKeys.list(),
  queryFn: ({ signal }) => getUsers(signal),
});

export function useUsers(): User[] {
  return useSuspenseQuery(usersQueryOptions).data;
}
