import { queryOptions, useSuspenseQuery } from '@tanstack/react-query';
import { downtimeReportSchema, type DowntimeReport } from '#shared/schemas/downtime.ts';
import { apiRequest } from '../../../lib/api-client.ts';
import { toSearch, windowQuery, type KpiWindow } from '../../../lib/kpi-window.ts';

export type DowntimeParams = KpiWindow;

// Downtime has no interval estimates: confidence stays out of the request and the key.
const paramsOf = (p: DowntimeParams) => windowQuery({ ...p, confidence: undefined });

export const downtimeKeys = {
  all: ['downtime'] as const,
  report: (p: DowntimeParams) => [...downtimeKeys.all, 'report', paramsOf(p)] as const,
};

/** GET /api/kpi/downtime: stop events, planned or not, their causes, lost volume and cost, and the Pareto tables. */
export function getDowntime(p: DowntimeParams, signal?: AbortSignal): Promise<DowntimeReport> {
  return apiRequest(`/kpi/downtime${toSearch(paramsOf(p))}`, { schema: downtimeReportSchema, signal });
}

export const downtimeQueryOptions = (p: DowntimeParams) =>
  queryOptions({
    queryKey: downtimeKeys.report(p),
    queryFn: ({ signal }) => getDowntime(p, signal),
  });

export function useDowntime(p: DowntimeParams): DowntimeReport {
  return useSuspenseQuery(downtimeQueryOptions(p)).data;
}
