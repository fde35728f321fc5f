import { queryOptions, useSuspenseQuery } from '@tanstack/react-query';
import { settingsSchema, type Settings } from '#shared/schemas/settings.ts';
import { apiRequest } from '../../../lib/api-client.ts';

export const settingsKeys = {
  all: ['settings'] as const,
  current: () => [...settingsKeys.all, 'current'] as const,
};

export function getSettings(signal?: AbortSignal): Promise<Settings> {
  return apiRequest('/settings', { schema: settingsSchema, signal });
}

export const settingsQueryOptions = queryOptions({
  queryKey: settingsKeys.current(),
  queryFn: ({ signal }) => getSettings(signal),
});

export function useSettings(): Settings {
  return useSuspenseQuery(settingsQueryOptions).data;
}
