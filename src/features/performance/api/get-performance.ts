import { queryOptions, useSuspenseQuery } from '@tanstack/react-query';
import { performanceReportSchema, type PerformanceReport } from '#shared/schemas/performance.ts';
import { apiRequest } from '../../../lib/api-client.ts';
import { toSearch, windowQuery, type KpiWindow } from '../../../lib/kpi-window.ts';

export type PerformanceParams = KpiWindow;

// Normalized performance has no interval estimates: confidence stays out of the request and the key.
const paramsOf = (p: PerformanceParams) => windowQuery({ ...p, confidence: undefined });

export const performanceKeys = {
  all: ['performance'] as const,
  report: (p: PerformanceParams) => [...performanceKeys.all, 'report', paramsOf(p)] as const,
};

/** GET /api/kpi/performance: normalized permeate flow, salt passage and ΔP per stage against its baseline (ASTM D4516), and alerts. */
export function getPerformance(p: PerformanceParams, signal?: AbortSignal): Promise<PerformanceReport> {
  return apiRequest(`/kpi/performance${toSearch(paramsOf(p))}`, { schema: performanceReportSchema, signal });
}

export const performanceQueryOptions = (p: PerformanceParams) =>
  queryOptions({
    queryKey: performanceKeys.report(p),
    queryFn: ({ signal }) => getPerformance(p, signal),
  });

export function usePerformance(p: PerformanceParams): PerformanceReport {
  return useSuspenseQuery(performanceQueryOptions(p)).data;
}
