import { queryOptions, useSuspenseQuery } from '@tanstack/react-query';
import { maintenanceMixReportSchema, type MaintenanceMixReport } from '#shared/schemas/maintenance-mix.ts';
import { apiRequest } from '../../../lib/api-client.ts';
import { toSearch, windowQuery, type KpiWindow } from '../../../lib/kpi-window.ts';

export type MaintenanceMixParams = KpiWindow;

// No interval estimates here: confidence stays out of the request and the key.
const paramsOf = (p: MaintenanceMixParams) => windowQuery({ ...p, confidence: undefined });

export const maintenanceMixKeys = {
  all: ['maintenance-mix'] as const,
  report: (p: MaintenanceMixParams) => [...maintenanceMixKeys.all, 'report', paramsOf(p)] as const,
};

/** GET /api/kpi/maintenance-mix: planned vs reactive hours, PM compliance, backlog and maintenance cost per m³. */
export function getMaintenanceMix(p: MaintenanceMixParams, signal?: AbortSignal): Promise<MaintenanceMixReport> {
  return apiRequest(`/kpi/maintenance-mix${toSearch(paramsOf(p))}`, { schema: maintenanceMixReportSchema, signal });
}

export const maintenanceMixQueryOptions = (p: MaintenanceMixParams) =>
  queryOptions({
    queryKey: maintenanceMixKeys.report(p),
    queryFn: ({ signal }) => getMaintenanceMix(p, signal),
  });

export function useMaintenanceMix(p: MaintenanceMixParams): MaintenanceMixReport {
  return useSuspenseQuery(maintenanceMixQueryOptions(p)).data;
}
