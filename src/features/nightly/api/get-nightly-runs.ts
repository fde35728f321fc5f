import { queryOptions, useSuspenseQuery } from '@tanstack/react-query';
import { nightlyRunListSchema, type NightlyRunList } from '#shared/schemas/nightly.ts';
import { apiRequest } from '../../../lib/api-client.ts';

export const nightlyRunsPageSize = 20;

export const nightlyKeys = {
  all: ['nightly-runs'] as const,
  page: (offset: number) => [...nightlyKeys.all, 'page', offset] as const,
};

/** How often the list is asked again while a run is under way (its files and steps move). */
export const runningPollMs = 3000;

/** GET /api/nightly-runs: one page, newest first. */
export function getNightlyRuns(offset: number, signal?: AbortSignal): Promise<NightlyRunList> {
  return apiRequest(`/nightly-runs?limit=${nightlyRunsPageSize}&offset=${offset}`, { schema: nightlyRunListSchema, signal });
}

export const nightlyRunsQueryOptions = (offset = 0) =>
  queryOptions({
    queryKey: nightlyKeys.page(offset),
    queryFn: ({ signal }) => getNightlyRuns(offset, signal),
    refetchInterval: (query) => (query.state.data?.runs.some((r) => r.outcome === null) ? runningPollMs : false),
  });

export function useNightlyRuns(offset: number): NightlyRunList {
  return useSuspenseQuery(nightlyRunsQueryOptions(offset)).data;
}
