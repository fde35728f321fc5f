// The time-to-complete answer (docs/design.md §6 Time to complete, §9 cautions) from the rows its service
// loads (server/services/time-to-complete.ts): what kind of job each work order is, the answer's window,
// calendar quarters for the learning curve, the figures (time-to-complete.ts), grouping and provenance.
import { TZDate } from '@date-fns/tz';
import { vesselWorkCautions } from '../cautions.ts';
import type { Provenance } from '../schemas/answer.ts';
import type { BeforeFreshness } from '../schemas/common.ts';
import type { TimeToCompleteQuery, TimeToCompleteReport } from '../schemas/time-to-complete.ts';
import { PROVENANCE_CAP } from './provenance.ts';
import { timeToComplete, type JobInfo, type JobSpan, type LearningBucket } from './time-to-complete.ts';

/** How a job's procedure is named, said in every answer. */
export const procedureDefinition =
  'procedure = what kind of job the work order is, from its asset and type: any work order on a pressure vessel is ' +
  "'element replacement' (opening a vessel to swap elements, the vessel job the step log records), except an " +
  "inspection, which is 'vessel inspection'; on any other asset it is '<asset kind> <work-order type>', e.g. " +
  "'pump corrective', 'filter preventive'. Failure codes and free-text descriptions are not used: they vary too " +
  'much between plants to group on.';

/** A job reduced to its span, with the work-order facts the groups are made of. */
export interface TimeToCompleteJob extends JobSpan {
  /** Work-order type. */
  type: string;
  crew: string | null;
  /** Kind of the asset the work order is on. */
  assetKind: string;
}

/** What the time-to-complete answer is built from, as server/services/time-to-complete.ts reads it. */
export interface TimeToCompleteReportInput {
  site: string;
  /** The site's IANA time zone: the learning curve's quarters are its calendar's. */
  timeZone: string;
  /** The extent of the site's work orders, where the query gives no bound (null where it gives one, or the site has none). */
  workOrderExtent: { from: Date | null; to: Date | null };
  /** The jobs on the assets in scope whose first step started in the window the query bounds. */
  jobs: readonly TimeToCompleteJob[];
}

/** The window the query gives (each bound null where it gives none) and its grouping. */
export interface TimeToCompleteWindow extends Pick<TimeToCompleteQuery, 'groupBy'> {
  from: Date | null;
  to: Date | null;
}

/** The procedure of a work order: see `procedureDefinition`. */
export function procedureOf(order: Pick<TimeToCompleteJob, 'assetKind' | 'type'>): string {
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

type LearningBucketAnswer = TimeToCompleteReport['learningCurve']['byPeriod'][number];

/** A learning-curve bucket as the answer gives it: ISO bounds, job numbers only for sequence buckets. */
function bucketOut(b: LearningBucket): LearningBucketAnswer {
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

/** Whether a group is kept for `groupBy`: `all` always; without groupBy every group, else only that kind. */
function keepGroup(key: string, groupBy: TimeToCompleteWindow['groupBy']): boolean {
  return (
    groupBy === undefined ||
    key === 'all' ||
    (groupBy === 'guided' && key.startsWith('guided=')) ||
    (groupBy === 'crew' && key.startsWith('crew=')) ||
    (groupBy === 'procedure' && key.startsWith('procedure='))
  );
}

/**
 * Time to complete (docs/design.md §6). Jobs are the work orders on the assets in scope whose first step
 * started in [from, to); a job lasts from its first step's start to its last step's end, in hours of
 * real elapsed time, and is guided when any step was done with the written procedure open. Groups:
 * all, guided=yes, guided=no, crew=… (work_orders.crew), procedure=… (`procedureDefinition`), each
 * with n, mean, median and p90 — type 7 sample quantiles (Hyndman & Fan 1996, R's default) — sd,
 * min and max; `groupBy` keeps `all` and only that kind of group. Learning curve: per calendar
 * quarter of job start in the site's zone, and per run of 10 jobs in start order.
 * Window: a bound the query gives; else the work orders' extent, widened to take in every job found
 * (to one second past the last start, the half-open end the site's data extent has).
 * Provenance: the jobs' work orders (the first PROVENANCE_CAP, and their count) and the window.
 * Degenerate input: no jobs → all/guided=yes/guided=no with n = 0 and null figures ('no-jobs').
 * The answer carries the vessel-work cautions (docs/design.md §9): these jobs open pressure vessels.
 */
export function buildTimeToCompleteReport(input: TimeToCompleteReportInput, window: TimeToCompleteWindow): BeforeFreshness<TimeToCompleteReport> {
  const rows = input.jobs;
  const info = rows.map((r): JobInfo => ({ woNumber: r.woNumber, crew: r.crew, procedure: procedureOf(r) }));
  let first = Infinity;
  let last = -Infinity;
  for (const r of rows) {
    first = Math.min(first, r.startedAt.getTime());
    last = Math.max(last, r.startedAt.getTime());
  }
  let from = window.from ?? input.workOrderExtent.from;
  let to = window.to ?? input.workOrderExtent.to;
  if (rows.length > 0) {
    if (window.from === null && (from === null || first < from.getTime())) from = new Date(first);
    // Half-open [from, to): one second past the last start, as the site's data extent does.
    if (window.to === null && (to === null || last >= to.getTime())) to = new Date(last + 1000);
  }
  const periods = rows.length === 0 ? [] : calendarQuarters(new Date(first), new Date(last), input.timeZone);
  const result = timeToComplete({ spans: rows, jobInfo: info, periods });

  const numbers = result.jobs.map((j) => j.woNumber).sort();
  const provenance: Provenance = {
    workOrders: numbers.slice(0, PROVENANCE_CAP),
    workOrderCount: numbers.length,
    tags: [],
    windows: from && to ? [{ from: from.toISOString(), to: to.toISOString(), what: 'jobs whose first step started in this window' }] : [],
  };
  return {
    site: input.site,
    from: from?.toISOString() ?? null,
    to: to?.toISOString() ?? null,
    quantileMethod: result.quantileMethod,
    groups: result.groups.filter((g) => keepGroup(g.key, window.groupBy)),
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
