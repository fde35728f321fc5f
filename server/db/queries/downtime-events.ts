// Stop events of run-status tags, as `osmia refresh` derives them (server/db/queries/derived.ts).
import type { Queryable } from './queryable.ts';

/** One stop of a run-status tag: [from, to), `to` null while still stopped at the end of the data. */
export interface StopRow {
  tagId: number;
  assetId: number;
  from: Date;
  to: Date | null;
}

/** Stops of the given tags that share time with [from, to), in time order. */
export async function listStopsOverlapping(q: Queryable, tagIds: readonly number[], from: Date, to: Date): Promise<StopRow[]> {
  if (tagIds.length === 0) return [];
  const { rows } = await q.query<StopRow>(
    `select tag_id as "tagId", asset_id as "assetId", from_ts as "from", to_ts as "to"
     from downtime_events
     where tag_id = any($1::int[]) and from_ts < $3 and (to_ts is null or to_ts > $2)
     order by tag_id, from_ts`,
    [tagIds, from, to],
  );
  return rows;
}

/** Per tag, the end of its last stop that ended strictly before `before` (a restart: the state there is running). */
export async function lastStopEndsBefore(q: Queryable, tagIds: readonly number[], before: Date): Promise<Map<number, Date>> {
  if (tagIds.length === 0) return new Map();
  const { rows } = await q.query<{ tagId: number; to: Date }>(
    `select tag_id as "tagId", max(to_ts) as "to" from downtime_events
     where tag_id = any($1::int[]) and to_ts < $2 group by tag_id`,
    [tagIds, before],
  );
  return new Map(rows.map((r) => [r.tagId, r.to]));
}
