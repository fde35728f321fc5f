import { queryOptions, useSuspenseQuery } from '@tanstack/react-query';
import { elementLifeReportSchema, type elementGroupByValues, type ElementLifeReport } from '#shared/schemas/element-life.ts';
import { apiRequest } from '../../../lib/api-client.ts';
import { toSearch, windowQuery, type KpiWindow } from '../../../lib/kpi-window.ts';

export type ElementGroupBy = (typeof elementGroupByValues)[number];

export interface ElementLifeParams extends KpiWindow {
  groupBy: ElementGroupBy;
}

const paramsOf = (p: ElementLifeParams) => ({ ...windowQuery(p), groupBy: p.groupBy });

export const elementLifeKeys = {
  all: ['element-life'] as const,
  report: (p: ElementLifeParams) => [...elementLifeKeys.all, 'report', paramsOf(p)] as const,
  forecast: (p: ElementLifeParams) => [...elementLifeKeys.all, 'forecast', paramsOf(p)] as const,
};

/** GET /api/kpi/element-life: Kaplan–Meier survival and the Weibull fit of element lives, per group. */
export function getElementLife(p: ElementLifeParams, signal?: AbortSignal): Promise<ElementLifeReport> {
  return apiRequest(`/kpi/element-life${toSearch(paramsOf(p))}`, { schema: elementLifeReportSchema, signal });
}

export const elementLifeQueryOptions = (p: ElementLifeParams) =>
  queryOptions({
    queryKey: elementLifeKeys.report(p),
    queryFn: ({ signal }) => getElementLife(p, signal),
  });

export function useElementLife(p: ElementLifeParams): ElementLifeReport {
  return useSuspenseQuery(elementLifeQueryOptions(p)).data;
}
