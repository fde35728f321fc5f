import { queryOptions, useSuspenseQuery } from '@tanstack/react-query';
import { meSchema, type User } from '#shared/schemas/users.ts';
import { apiRequest, isApiError } from '../../../lib/api-client.ts';

export const authKeys = {
  all: ['auth'] as const,
  me: () => [...authKeys.all, 'me'] as const,
};

/** The signed-in user, or null without a valid session (the API answers 401). */
export async function getMe(signal?: AbortSignal): Promise<User | null> {
  try {
    const { user } = await apiRequest('/auth/me', { schema: meSchema, signal });
    return user;
  } catch (err) {
    if (isApiError(err, 401)) return null;
    throw err;
  }
}

export const meQueryOptions = queryOptions({
  queryKey: authKeys.me(),
  queryFn: ({ signal }) => getMe(signal),
  staleTime: 5 * 60_000,
});

/** The signed-in user; suspends until known. */
export function useMe(): User | null {
  return useSuspenseQuery(meQueryOptions).data;
}
