// Time to complete: the job spans of the work orders in scope and window and the extent of the site's
// work orders — then `buildTimeToCompleteReport` (shared/kpi/time-to-complete-report.ts) applies the rules.
import { buildTimeToCompleteReport, type TimeToCompleteReportInput } from '#shared/kpi/time-to-complete-report.ts';
import type { BeforeFreshness } from '#shared/schemas/common.ts';
import type { TimeToCompleteQuery, TimeToCompleteReport } from '#shared/schemas/time-to-complete.ts';
import type { Db } from '../db/client.ts';
import { listJobSpans } from '../db/queries/job-steps.ts';
import { dataExtent, queryBounds, resolveSite, scopeOfSite } from './scope.ts';

/** The time-to-complete answer as the service computes it: exactly the schema's type, before freshness. */
export type TimeToCompleteAnswer = BeforeFreshness<TimeToCompleteReport>;

/**
 * What the time-to-complete answer is built from, and the window the query gives. The jobs are searched
 * within the query's bounds only (no default extent): the site's data extent does not look at job steps,
 * and a still-open work order's steps can come after it; the work orders' extent, read where the query
 * gives no bound, is what the answer's window defaults to. Site-wide (no asset asked about) the jobs need
 * only the site, so they, the assets and that extent are read in one wait.
 */
export async function loadTimeToCompleteInput(
  db: Db,
  query: TimeToCompleteQuery,
): Promise<{ input: TimeToCompleteReportInput; from: Date | null; to: Date | null }> {
  const site = await resolveSite(db, query.site);
  const bounds = queryBounds(query, site.timeZone);
  const [scope, siteJobs, extent] = await Promise.all([
    scopeOfSite(db, site, query, []),
    query.asset ? null : listJobSpans(db.$client, site.id, null, bounds.from, bounds.to),
    query.from && query.to ? { from: null, to: null } : dataExtent(db, site.id, ['work-orders']),
  ]);
  const jobs = siteJobs ?? (await listJobSpans(db.$client, site.id, scope.inScope.map((a) => a.id), scope.from, scope.to));
  return { input: { site: site.code, timeZone: site.timeZone, workOrderExtent: extent, jobs }, from: scope.from, to: scope.to };
}

/**
 * Time to complete (docs/design.md §6) for the work orders on the asset asked about and everything below
 * it: `loadTimeToCompleteInput`, then `buildTimeToCompleteReport`. The answer carries the vessel-work
 * cautions (docs/design.md §9).
 */
export async function getTimeToComplete(db: Db, query: TimeToCompleteQuery): Promise<TimeToCompleteAnswer> {
  const { input, from, to } = await loadTimeToCompleteInput(db, query);
  return buildTimeToCompleteReport(input, { from, to, groupBy: query.groupBy });
}
