import { queryOptions, useSuspenseQuery } from '@tanstack/react-query';
import { timeToCompleteReportSchema, type TimeToCompleteReport } from '#shared/schemas/time-to-complete.ts';
import { apiRequest } from '../../../lib/api-client.ts';
import { toSearch, windowQuery, type KpiWindow } from '../../../lib/kpi-window.ts';

export type TimeToCompleteParams = KpiWindow;

// Confidence does not enter these figures: it stays out of the request and the key.
const paramsOf = (p: TimeToCompleteParams) => windowQuery({ ...p, confidence: undefined });

export const timeToCompleteKeys = {
  all: ['time-to-complete'] as const,
  report: (p: TimeToCompleteParams) => [...timeToCompleteKeys.all, 'report', paramsOf(p)] as const,
};

/** GET /api/kpi/time-to-complete: job durations by procedure, crew and guided vs unguided, the learning curve and the jobs. */
export function getTimeToComplete(p: TimeToCompleteParams, signal?: AbortSignal): Promise<TimeToCompleteReport> {
  return apiRequest(`/kpi/time-to-complete${toSearch(paramsOf(p))}`, { schema: timeToCompleteReportSchema, signal });
}

export const timeToCompleteQueryOptions = (p: TimeToCompleteParams) =>
  queryOptions({
    queryKey: timeToCompleteKeys.report(p),
    queryFn: ({ signal }) => getTimeToComplete(p, signal),
  });

export function useTimeToComplete(p: TimeToCompleteParams): TimeToCompleteReport {
  return useSuspenseQuery(timeToCompleteQueryOptions(p)).data;
}
