// Time to complete maintenance jobs, from the job step log: per job, per group (guided or not,
// crew, procedure) and as a learning curve over time.
import type { TimeToCompleteReport } from '../schemas/time-to-complete.ts';
import { mean, quantileMethod, quantileType7, sampleSd } from './stats.ts';

const HOUR_MS = 3_600_000;

export interface JobStepRow {
  woNumber: string;
  step: number;
  startedAt: Date;
  completedAt: Date;
  /** Done with the written procedure open. */
  guided: boolean;
  technician?: string | null;
}

/** Work-order facts the step log does not carry; the caller joins them in. */
export interface JobInfo {
  woNumber: string;
  crew?: string | null;
  /** What kind of job this is (e.g. the procedure followed); free text, used as a group key. */
  procedure?: string | null;
}

export interface Job {
  woNumber: string;
  startedAt: Date;
  completedAt: Date;
  hours: number;
  guided: boolean;
  steps: number;
  crew: string | null;
  procedure: string | null;
}

export type SkipReason = 'non-positive-duration' | 'invalid-time';

/** One group's figures: the schema's type (shared/schemas/time-to-complete.ts). */
export type GroupStats = TimeToCompleteReport['groups'][number];

export interface LearningBucket {
  label: string;
  /** Period buckets: the period's bounds; sequence buckets: first and last job's start. */
  start: Date | null;
  end: Date | null;
  /** Sequence buckets: 1-based numbers of the first and last job in start order. */
  firstJob?: number;
  lastJob?: number;
  n: number;
  medianHours: number | null;
  meanHours: number | null;
}

export interface TimeToCompleteResult {
  quantileMethod: typeof quantileMethod;
  groups: GroupStats[];
  jobs: Job[];
  skipped: Array<{ woNumber: string; reason: SkipReason }>;
  skippedCounts: Record<SkipReason, number>;
  learningCurve: { byPeriod: LearningBucket[]; bySequence: LearningBucket[] };
}

/** A job reduced to its span: first step start, last step end, any step guided, how many steps. */
export interface JobSpan {
  woNumber: string;
  startedAt: Date;
  completedAt: Date;
  guided: boolean;
  steps: number;
}

/** The job spans of a step log, one per work order, in order of first appearance. */
export function jobSpansOf(steps: readonly JobStepRow[]): JobSpan[] {
  const spans = new Map<string, JobSpan>();
  for (const step of steps) {
    const span = spans.get(step.woNumber);
    if (!span) {
      spans.set(step.woNumber, { woNumber: step.woNumber, startedAt: step.startedAt, completedAt: step.completedAt, guided: step.guided, steps: 1 });
      continue;
    }
    // NaN (an invalid Date) sticks, so the job is reported as invalid rather than measured from its valid steps.
    const start = Math.min(span.startedAt.getTime(), step.startedAt.getTime());
    const end = Math.max(span.completedAt.getTime(), step.completedAt.getTime());
    span.startedAt = new Date(start);
    span.completedAt = new Date(end);
    span.guided ||= step.guided;
    span.steps += 1;
  }
  return [...spans.values()];
}

export interface TimeToCompleteInput {
  /** The step log; or `spans`, the jobs already reduced (e.g. by the database's min/max per work order). */
  steps?: readonly JobStepRow[];
  spans?: readonly JobSpan[];
  jobInfo?: readonly JobInfo[];
  /** Learning-curve periods (e.g. calendar quarters, bounds worked out in the site's time zone). */
  periods?: ReadonlyArray<{ label: string; start: Date; end: Date }>;
  /** Jobs per learning-curve bucket in start order; default 10. */
  sequenceBucketSize?: number;
}

/**
 * Time to complete. A job (one work order) lasts from its earliest step start to its latest step
 * end, in hours of real elapsed time (Date differences: a daylight-saving change neither adds nor
 * removes an hour); it counts as guided when any of its steps was guided (docs/design.md §5).
 * Per group — all, guided=yes, guided=no, crew=…, procedure=… — n, mean, median and 90th
 * percentile (type 7 sample quantile, Hyndman & Fan 1996, R's default), sample sd, min and max.
 * Learning curve: n, median and mean per caller-given period (by job start, half-open [start, end))
 * and per run of `sequenceBucketSize` jobs in start order.
 * Nothing is rejected here (rows are validated at import), but a job whose duration is not positive
 * (or whose times are invalid Dates) is left out and listed in `skipped` with a reason and counted.
 * Degenerate input: no steps → no jobs; the all/guided=yes/guided=no groups are still listed with
 * n = 0 and null figures ('no-jobs'). Throws only on a non-positive or fractional bucket size.
 */
export function timeToComplete(input: TimeToCompleteInput): TimeToCompleteResult {
  const bucketSize = input.sequenceBucketSize ?? 10;
  if (!Number.isInteger(bucketSize) || bucketSize < 1)
    throw new RangeError('sequenceBucketSize must be a whole number ≥ 1.');
  const info = new Map<string, JobInfo>();
  for (const row of input.jobInfo ?? []) if (!info.has(row.woNumber)) info.set(row.woNumber, row);

  const jobs: Job[] = [];
  const skipped: TimeToCompleteResult['skipped'] = [];
  for (const span of input.spans ?? jobSpansOf(input.steps ?? [])) {
    const { woNumber } = span;
    const start = span.startedAt.getTime();
    const end = span.completedAt.getTime();
    if (!Number.isFinite(start) || !Number.isFinite(end)) {
      skipped.push({ woNumber, reason: 'invalid-time' });
      continue;
    }
    if (end <= start) {
      skipped.push({ woNumber, reason: 'non-positive-duration' });
      continue;
    }
    const extra = info.get(woNumber);
    jobs.push({
      woNumber,
      startedAt: new Date(start),
      completedAt: new Date(end),
      hours: (end - start) / HOUR_MS,
      guided: span.guided,
      steps: span.steps,
      crew: extra?.crew ?? null,
      procedure: extra?.procedure ?? null,
    });
  }
  jobs.sort((a, b) => a.startedAt.getTime() - b.startedAt.getTime() || compareText(a.woNumber, b.woNumber));

  const groups: GroupStats[] = [
    groupStats('all', jobs),
    groupStats(
      'guided=yes',
      jobs.filter((j) => j.guided),
    ),
    groupStats(
      'guided=no',
      jobs.filter((j) => !j.guided),
    ),
  ];
  for (const field of ['crew', 'procedure'] as const) {
    const values = [...new Set(jobs.map((j) => j[field]).filter((v): v is string => v !== null))].sort(compareText);
    for (const value of values)
      groups.push(
        groupStats(
          `${field}=${value}`,
          jobs.filter((j) => j[field] === value),
        ),
      );
  }

  const byPeriod = (input.periods ?? []).map((p) => {
    const inPeriod = jobs.filter((j) => j.startedAt >= p.start && j.startedAt < p.end);
    return bucket(p.label, p.start, p.end, inPeriod);
  });
  const bySequence: LearningBucket[] = [];
  for (let i = 0; i < jobs.length; i += bucketSize) {
    const chunk = jobs.slice(i, i + bucketSize);
    const first = i + 1;
    const last = i + chunk.length;
    bySequence.push({
      ...bucket(`jobs ${first}–${last}`, chunk[0]!.startedAt, chunk[chunk.length - 1]!.startedAt, chunk),
      firstJob: first,
      lastJob: last,
    });
  }

  const skippedCounts: Record<SkipReason, number> = { 'non-positive-duration': 0, 'invalid-time': 0 };
  for (const s of skipped) skippedCounts[s.reason] += 1;
  return { quantileMethod, groups, jobs, skipped, skippedCounts, learningCurve: { byPeriod, bySequence } };
}

function groupStats(key: string, jobs: readonly Job[]): GroupStats {
  const hours = jobs.map((j) => j.hours);
  if (hours.length === 0) {
    return {
      key,
      n: 0,
      meanHours: null,
      medianHours: null,
      p90Hours: null,
      sdHours: null,
      minHours: null,
      maxHours: null,
      reason: 'no-jobs',
    };
  }
  return {
    key,
    n: hours.length,
    meanHours: mean(hours).value,
    medianHours: quantileType7(hours, 0.5).value,
    p90Hours: quantileType7(hours, 0.9).value,
    sdHours: sampleSd(hours).value,
    minHours: hours.reduce((a, b) => Math.min(a, b)),
    maxHours: hours.reduce((a, b) => Math.max(a, b)),
  };
}

function bucket(label: string, start: Date | null, end: Date | null, jobs: readonly Job[]): LearningBucket {
  const hours = jobs.map((j) => j.hours);
  return {
    label,
    start,
    end,
    n: hours.length,
    medianHours: quantileType7(hours, 0.5).value,
    meanHours: mean(hours).value,
  };
}

function compareText(a: string, b: string): number {
  return a < b ? -1 : a > b ? 1 : 0;
}
