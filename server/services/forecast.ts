// Element replacement forecast: the element life input of the scope (element-life.ts), the site's time
// zone and the clock — then the pure builder in shared/kpi/forecast-report.ts.
import { buildForecastReport, type ForecastAnswer } from '#shared/kpi/forecast-report.ts';
import type { ForecastQuery } from '#shared/schemas/forecast.ts';
import type { Settings } from '#shared/schemas/settings.ts';
import type { Db } from '../db/client.ts';
import { loadElementInput } from './element-life.ts';

/** The replacement forecast from the window's end (or now, for a site without element data): `buildForecastReport`. */
export async function getForecast(db: Db, query: ForecastQuery, settings: Settings): Promise<ForecastAnswer> {
  const { scope, input } = await loadElementInput(db, query);
  // The service may read the clock; only shared/ may not. Without any data there is no other start
  // (and no installs).
  return buildForecastReport(
    { ...input, timeZone: scope.site.timeZone },
    { from: scope.from, to: scope.to, now: new Date(), confidence: query.confidence, groupBy: query.groupBy, months: query.months, renewal: query.renewal },
    settings,
  );
}
