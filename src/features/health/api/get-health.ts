import { queryOptions, useSuspenseQuery } from '@tanstack/react-query';
import { healthSchema, type Health } from '#shared/schemas/health.ts';
import { apiRequest } from '../../../lib/api-client.ts';

export const healthKeys = {
  all: ['health'] as const,
  current: () => [...healthKeys.all, 'current'] as const,
};

/** GET /api/health; a degraded server answers 503 with the same body, which is shown, not thrown. */
export function getHealth(signal?: AbortSignal): Promise<Health> {
  return apiRequest('/health', { schema: healthSchema, signal, acceptStatuses: [503] });
}

export const healthQueryOptions = queryOptions({
  queryKey: healthKeys.current(),
  queryFn: ({ signal }) => getHealth(signal),
  refetchInterval: 30_000,
});

export function useHealth(): Health {
  return useSuspenseQuery(healthQueryOptions).data;
}
