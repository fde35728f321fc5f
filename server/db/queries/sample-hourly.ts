// Reads of the hourly rollups (sample_hourly, built by `osmia refresh` from good samples only).
import type { Queryable } from './queryable.ts';

export interface HourlyIntegral {
  tagId: number;
  /** Σ hourly mean × hours of that hour inside the window (m³ for a flow in m³/h). */
  integral: number;
  /** Hours inside the window that have a rollup (at least one good sample). */
  hoursCovered: number;
}

/**
 * Per tag, the time integral of its hourly means over [from, to): each UTC hour's mean times the
 * part of that hour inside the window, in hours. Hours without a good sample have no rollup and add
 * nothing; `hoursCovered` says how much of the window had data. Tags without rollups are absent.
 */
export async function integrateHourlyMeans(q: Queryable, tagIds: readonly number[], from: Date, to: Date): Promise<HourlyIntegral[]> {
  if (tagIds.length === 0 || !(from < to)) return [];
  const { rows } = await q.query<{ tagId: number; integral: number; hoursCovered: number }>(
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
