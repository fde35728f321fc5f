import { queryOptions, useSuspenseQuery } from '@tanstack/react-query';
import { openWorkOrdersSchema, type OpenWorkOrders } from '#shared/schemas/work-orders.ts';
import { apiRequest } from '../../../lib/api-client.ts';
import { toSearch, type KpiWindow } from '../../../lib/kpi-window.ts';

/** Open at the end of the window: only the site, the asset and `to` matter, and how many to list. */
export type OpenWorkOrdersParams = Pick<KpiWindow, 'site' | 'asset' | 'to'> & { limit?: number };

const paramsOf = (p: OpenWorkOrdersParams) => {
  const out: Record<string, string | number> = {};
  if (p.site) out.site = p.site;
  if (p.asset) out.asset = p.asset;
  if (p.to) out.to = p.to;
  if (p.limit !== undefined) out.limit = p.limit;
  return out;
};

export const workOrderKeys = {
  all: ['work-orders'] as const,
  open: (p: OpenWorkOrdersParams) => [...workOrderKeys.all, 'open', paramsOf(p)] as const,
};

/** GET /api/work-orders/open: the work orders open at the window end, overdue first, with the backlog hours. */
export function getOpenWorkOrders(p: OpenWorkOrdersParams, signal?: AbortSignal): Promise<OpenWorkOrders> {
  return apiRequest(`/work-orders/open${toSearch(paramsOf(p))}`, { schema: openWorkOrdersSchema, signal });
}

export const openWorkOrdersQueryOptions = (p: OpenWorkOrdersParams) =>
  queryOptions({
    queryKey: workOrderKeys.open(p),
    queryFn: ({ signal }) => getOpenWorkOrders(p, signal),
  });

export function useOpenWorkOrders(p: OpenWorkOrdersParams): OpenWorkOrders {
  return useSuspenseQuery(openWorkOrdersQueryOptions(p)).data;
}
