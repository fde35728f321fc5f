// Time to complete: the job steps of the work orders in scope and window, what kind of job each
// work order is (its "procedure"), calendar quarters for the learning curve — then
// shared/kpi/time-to-complete.ts.
import type { BeforeFreshness } from '#shared/schemas/common.ts';
import { TZDate } from '@date-fns/tz';
import { vesselWorkCautions } from '#shared/cautions.ts';
import { timeToComplete, type JobInfo, type LearningBucket } from '#shared/kpi/time-to-complete.ts';
import type { Provenance } from '#shared/schemas/answer.ts';
import type { TimeToCompleteQuery, TimeToCompleteReport } from '#shared/schemas/time-to-complete.ts';
import type { Db } from '../db/client.ts';
import { listJobSpans, type JobSpanWithOrder } from '../db/queries/job-steps.ts';
import { dataExtent, queryBounds, resolveSite, scopeOfSite } from './scope.ts';
import { PROVENANCE_CAP } from './provenance.ts';


/** How a job's procedure is named, said in every answer. */
export const procedureDefinition =
  'procedure = what kind of job the work order is, from its asset and type: any work order on a pressure vessel is ' +
  "'element replacement' (opening a vessel to swap elements, the vessel job the step log records), except an " +
  "inspection, which is 'vessel inspection'; on any other asset it is '<asset kind> <work-order type>', e.g. " +
  "'pump corrective', 'filter preventive'. Failure codes and free-text descriptions are not used: they vary too " +
  'much between plants to group on.';

/** The procedure of a work order: see `procedureDefinition`. */
export function procedureOf(order: Pick<JobSpanWithOrder, 'assetKind' | 'type'>): string {
  if (order.assetKind === 'vessel') return order.type === 'inspection' ? 'vessel inspection' : 'element replacement';
  return `${order.assetKind} ${order.type}`;
}

/**
 * Calendar quarters in the site's zone from the quarter of `first` to the quarter of `last`
 * (inclusive), labelled `2025-Q1`; bounds are local midnights of Jan/Apr/Jul/Oct 1st.
 */
export function calendarQuarters(first: Date, last: Date, timeZone: string): Array<{ label: string; start: Date; end: Date }> {
  const a = new TZDate(first.getTime(), timeZone);
  const b = new TZDate(last.getTime(), timeZone);
  const index = (d: TZDate) => d.getFullYear() * 4 + Math.floor(d.getMonth() / 3);
  const startOf = (q: number) => new Date(new TZDate(Math.floor(q / 4), (q % 4) * 3, 1, timeZone).getTime());
  const out: Array<{ label: string; start: Date; end: Date }> = [];
  for (let q = index(a); q <= index(b); q++) out.push({ label: `${Math.floor(q / 4)}-Q${(q % 4) + 1}`, start: startOf(q), end: startOf(q + 1) });
  return out;
}

type TimeToCompleteGroup = TimeToCompleteReport['groups'][number];

/** The answer plus the cautions of vessel work and the procedure rule, both shown beside it. */
export type TimeToCompleteAnswer = BeforeFreshness<TimeToCompleteReport> & {
  procedureDefinition: string;
  /** Safety cautions for the vessel work most of these jobs are (shared/cautions.ts, docs/design.md §9). */
  cautions: readonly string[];
};

function bucketOut(b: LearningBucket) {
  return {
    label: b.label,
    start: b.start?.toISOString() ?? null,
    end: b.end?.toISOString() ?? null,
    ...(b.firstJob === undefined ? {} : { firstJob: b.firstJob }),
    ...(b.lastJob === undefined ? {} : { lastJob: b.lastJob }),
    n: b.n,
    medianHours: b.medianHours,
    meanHours: b.meanHours,
  };
}

/**
 * Time to complete (docs/design.md §6). Jobs are the work orders on the assets in scope whose first step
 * started in [from, to); a job lasts from its first step's start to its last step's end, in hours of
 * real elapsed time, and is guided when any step was done with the written procedure open. Groups:
 * all, guided=yes, guided=no, crew=… (work_orders.crew), procedure=… (`procedureDefinition`), each
 * with n, mean, median and p90 — type 7 sample quantiles (Hyndman & Fan 1996, R's default) — sd,
 * min and max; `groupBy` keeps `all` and only that kind of group. Learning curve: per calendar
 * quarter of job start in the site's zone, and per run of 10 jobs in start order.
 * Degenerate input: no jobs → all/guided=yes/guided=no with n = 0 and null figures ('no-jobs').
 * The answer carries the vessel-work cautions (docs/design.md §9): these jobs open pressure vessels.
 */
export async function getTimeToComplete(db: Db, query: TimeToCompleteQuery): Promise<TimeToCompleteAnswer> {
  // The jobs are searched within the query's bounds only (no default extent): the site's data extent
  // does not look at job steps, and a still-open work order's steps can come after it. The answer's
  // window is the work orders' extent widened to the jobs found. Site-wide (no asset asked about) the
  // jobs need only the site, so they, the assets and that extent are read in one wait.
  const site = await resolveSite(db, query.site);
  const bounds = queryBounds(query, site.timeZone);
  const [scope, siteJobs, extent] = await Promise.all([
    scopeOfSite(db, site, query, []),
    query.asset ? null : listJobSpans(db.$client, site.id, null, bounds.from, bounds.to),
    query.from && query.to ? { from: null, to: null } : dataExtent(db, site.id, ['work-orders']),
  ]);
  const rows = siteJobs ?? (await listJobSpans(db.$client, site.id, scope.inScope.map((a) => a.id), scope.from, scope.to));
  const info = rows.map((r): JobInfo => ({ woNumber: r.woNumber, crew: r.crew, procedure: procedureOf(r) }));
  let first = Infinity;
  let last = -Infinity;
  for (const r of rows) {
    first = Math.min(first, r.startedAt.getTime());
    last = Math.max(last, r.startedAt.getTime());
  }
  let from = query.from ? scope.from : extent.from;
  let to = query.to ? scope.to : extent.to;
  if (rows.length > 0) {
    if (!query.from && (from === null || first < from.getTime())) from = new Date(first);
    // Half-open [from, to): one second past the last start, as the site's data extent does.
    if (!query.to && (to === null || last >= to.getTime())) to = new Date(last + 1000);
  }
  const periods = rows.length === 0 ? [] : calendarQuarters(new Date(first), new Date(last), scope.site.timeZone);
  const result = timeToComplete({ spans: rows, jobInfo: info, periods });

  const kinds = query.groupBy;
  const keep = (g: { key: string }) =>
    kinds === undefined ||
    g.key === 'all' ||
    (kinds === 'guided' && g.key.startsWith('guided=')) ||
    (kinds === 'crew' && g.key.startsWith('crew=')) ||
    (kinds === 'procedure' && g.key.startsWith('procedure='));
  const groups: TimeToCompleteGroup[] = result.groups.filter(keep).map((g) => ({
    key: g.key,
    n: g.n,
    meanHours: g.meanHours,
    medianHours: g.medianHours,
    p90Hours: g.p90Hours,
    sdHours: g.sdHours,
    minHours: g.minHours,
    maxHours: g.maxHours,
    ...(g.reason ? { reason: g.reason } : {}),
  }));
  const numbers = result.jobs.map((j) => j.woNumber).sort();
  const provenance: Provenance & { workOrderCount: number } = {
    workOrders: numbers.slice(0, PROVENANCE_CAP),
    workOrderCount: numbers.length,
    tags: [],
    windows: from && to ? [{ from: from.toISOString(), to: to.toISOString(), what: 'jobs whose first step started in this window' }] : [],
  };
  return {
    site: scope.site.code,
    from: from?.toISOString() ?? null,
    to: to?.toISOString() ?? null,
    quantileMethod: result.quantileMethod,
    groups,
    jobs: result.jobs.map((j) => ({
      woNumber: j.woNumber,
      startedAt: j.startedAt.toISOString(),
      completedAt: j.completedAt.toISOString(),
      hours: j.hours,
      guided: j.guided,
      steps: j.steps,
      crew: j.crew,
      procedure: j.procedure,
    })),
    skipped: result.skipped,
    learningCurve: { byPeriod: result.learningCurve.byPeriod.map(bucketOut), bySequence: result.learningCurve.bySequence.map(bucketOut) },
    procedureDefinition,
    cautions: [...vesselWorkCautions],
    provenance,
  };
}
