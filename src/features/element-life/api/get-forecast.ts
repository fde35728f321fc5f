import { queryOptions, useSuspenseQuery } from '@tanstack/react-query';
import { forecastReportSchema, type ForecastReport } from '#shared/schemas/forecast.ts';
import { apiRequest } from '../../../lib/api-client.ts';
import { toSearch, windowQuery } from '../../../lib/kpi-window.ts';
import { elementLifeKeys, type ElementLifeParams } from './get-element-life.ts';

/** The forecast always looks 12 months ahead of the window's end (docs/design.md §6: next year's purchases). */
const months = 12;

const paramsOf = (p: ElementLifeParams) => ({ ...windowQuery(p), groupBy: p.groupBy, months });

/** GET /api/kpi/forecast: expected life-ending events and their cost per month, with the band of the fit's uncertainty. */
export function getForecast(p: ElementLifeParams, signal?: AbortSignal): Promise<ForecastReport> {
  return apiRequest(`/kpi/forecast${toSearch(paramsOf(p))}`, { schema: forecastReportSchema, signal });
}

export const forecastQueryOptions = (p: ElementLifeParams) =>
  queryOptions({
    queryKey: elementLifeKeys.forecast(p),
    queryFn: ({ signal }) => getForecast(p, signal),
  });

export function useForecast(p: ElementLifeParams): ForecastReport {
  return useSuspenseQuery(forecastQueryOptions(p)).data;
}
