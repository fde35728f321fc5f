import { queryOptions, useSuspenseQuery } from '@tanstack/react-query';
import { reportListSchema, type ReportList } from '#shared/schemas/reports.ts';
import { apiRequest } from '../../../lib/api-client.ts';

export const reportsKeys = {
  all: ['reports'] as const,
  list: () => [...reportsKeys.all, 'list'] as const,
};

/** GET /api/reports: the workbooks the signed-in role may build, and the stored ones it may download. */
export function getReports(signal?: AbortSignal): Promise<ReportList> {
  return apiRequest('/reports', { schema: reportListSchema, signal });
}

export const reportsQueryOptions = queryOptions({
  queryKey: reportsKeys.list(),
  queryFn: ({ signal }) => getReports(signal),
});

export function useReports(): ReportList {
  return useSuspenseQuery(reportsQueryOptions).data;
}
