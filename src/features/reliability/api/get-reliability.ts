import { queryOptions, useSuspenseQuery } from '@tanstack/react-query';
import { reliabilityReportSchema, type reliabilityGroupByValues, type ReliabilityReport } from '#shared/schemas/reliability.ts';
import { apiRequest } from '../../../lib/api-client.ts';
import { toSearch, windowQuery, type KpiWindow } from '../../../lib/kpi-window.ts';

export type ReliabilityGroupBy = (typeof reliabilityGroupByValues)[number];

export interface ReliabilityParams extends KpiWindow {
  groupBy: ReliabilityGroupBy;
}

const paramsOf = (p: ReliabilityParams) => ({ ...windowQuery(p), groupBy: p.groupBy });

export const reliabilityKeys = {
  all: ['reliability'] as const,
  report: (p: ReliabilityParams) => [...reliabilityKeys.all, 'report', paramsOf(p)] as const,
};

/** GET /api/kpi/reliability: MTBF with bounds, MTTR and availability of the site or asset, and per group. */
export function getReliability(p: ReliabilityParams, signal?: AbortSignal): Promise<ReliabilityReport> {
  return apiRequest(`/kpi/reliability${toSearch(paramsOf(p))}`, { schema: reliabilityReportSchema, signal });
}

export const reliabilityQueryOptions = (p: ReliabilityParams) =>
  queryOptions({
    queryKey: reliabilityKeys.report(p),
    queryFn: ({ signal }) => getReliability(p, signal),
  });

export function useReliability(p: ReliabilityParams): ReliabilityReport {
  return useSuspenseQuery(reliabilityQueryOptions(p)).data;
}
