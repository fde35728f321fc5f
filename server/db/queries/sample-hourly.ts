// Hourly rollups of good-quality samples (built by `osmia refresh`): what KPIs read instead of raw samples.
import type { Queryable } from './queryable.ts';

/** The first hour with a good sample and the instant of the last good sample of a tag. */
export interface GoodDataExtent {
  tagId: number;
  firstHour: Date;
  lastTs: Date;
}

export async function goodDataExtents(q: Queryable, tagIds: readonly number[]): Promise<Map<number, GoodDataExtent>> {
  if (tagIds.length === 0) return new Map();
  const { rows } = await q.query<GoodDataExtent>(
    `select tag_id as "tagId", min(hour) as "firstHour", max(last_ts) as "lastTs" from sample_hourly
     where tag_id = any($1::int[]) group by tag_id`,
    [tagIds],
  );
  return new Map(rows.map((r) => [r.tagId, r]));
}

/** The mean of one tag over the qualifying hours of one day. */
export interface DailyMeanRow {
  /** Local midnight (in the given time zone) of the day, as an instant. */
  day: Date;
  tagId: number;
  mean: number;
  /** Qualifying hours averaged. */
  hours: number;
}

export interface DailyMeansQuery {
  /** Run-status tag: an hour qualifies only when its lowest good run-status sample is 1 (ran the whole hour). */
  runTagId: number;
  /** Tags that must all have a good sample in the hour for it to qualify. */
  requiredTagIds: readonly number[];
  /** Tags averaged over the qualifying hours where they have data (need not qualify the hour). */
  optionalTagIds: readonly number[];
  /** Whole hours inside [from, to) only. */
  from: Date;
  to: Date;
  /** Days are calendar days in this IANA zone (the site's). */
  timeZone: string;
}

/**
 * Daily means of hourly means (each qualifying hour weighs the same) of the required and optional tags,
 * over the whole hours in [from, to) when the run-status tag's hourly minimum is 1 and every required tag
 * has a good sample. One pass over the rollups of these tags (window functions, no self-join), so the plan
 * does not depend on fresh statistics.
 */
export async function dailyMeansWhileRunning(q: Queryable, query: DailyMeansQuery): Promise<DailyMeanRow[]> {
  const { rows } = await q.query<DailyMeanRow>(
    `select date_trunc('day', hour at time zone $6::text) at time zone $6::text as "day", tag_id as "tagId",
            avg(mean) as "mean", count(*)::int as "hours"
     from (
       select hour, tag_id, mean,
              min(min) filter (where tag_id = $1) over (partition by hour) as run_min,
              count(*) filter (where tag_id = any($2::int[])) over (partition by hour) as required_n
       from sample_hourly
       where tag_id = any($1::int || $2::int[] || $3::int[])
         and hour >= $4::timestamptz and hour <= $5::timestamptz - interval '1 hour'
     ) h
     where run_min >= 1 and required_n = cardinality($2::int[]) and tag_id <> $1
     group by 1, 2 order by 1, 2`,
    [query.runTagId, query.requiredTagIds, query.optionalTagIds, query.from, query.to, query.timeZone],
  );
  return rows;
}

/** Per tag, the time integral of its hourly means over a window, and how much of the window had data. */
export interface HourlyIntegral {
  tagId: number;
  /** Σ hourly mean × hours of that hour inside the window (m³ for a flow in m³/h). */
  integral: number;
  /** Hours inside the window that have a rollup (at least one good sample). */
  hoursCovered: number;
}

/**
 * Per tag, Σ over the UTC hours overlapping [from, to) of the hour's mean × the part of that hour
 * inside the window, in hours. Hours without a good sample have no rollup and add nothing
 * (`hoursCovered` says how much of the window had data); tags without rollups are absent.
 */
export async function integrateHourlyMeans(q: Queryable, tagIds: readonly number[], from: Date, to: Date): Promise<HourlyIntegral[]> {
  if (tagIds.length === 0 || !(from < to)) return [];
  const { rows } = await q.query<HourlyIntegral>(
    `select tag_id as "tagId",
            sum(mean * extract(epoch from least(hour + interval '1 hour', $3::timestamptz) - greatest(hour, $2::timestamptz)) / 3600)::float8 as integral,
            sum(extract(epoch from least(hour + interval '1 hour', $3::timestamptz) - greatest(hour, $2::timestamptz)) / 3600)::float8 as "hoursCovered"
     from sample_hourly
     where tag_id = any($1::int[]) and hour < $3 and hour > $2::timestamptz - interval '1 hour'
     group by tag_id
     order by tag_id`,
    [tagIds, from, to],
  );
  return rows;
}
