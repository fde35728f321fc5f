import { queryOptions } from '@tanstack/react-query';
import { siteListSchema, type Site } from '#shared/schemas/sites.ts';
import { apiRequest } from '../../../lib/api-client.ts';

export const sitesKeys = {
  all: ['sites'] as const,
};

export async function getSites(signal?: AbortSignal): Promise<Site[]> {
  return (await apiRequest('/sites', { schema: siteListSchema, signal })).sites;
}

export const sitesQueryOptions = queryOptions({
  queryKey: sitesKeys.all,
  queryFn: ({ signal }) => getSites(signal),
  // Sites change only when an asset register for a new one is imported.
  staleTime: 5 * 60_000,
});
