// Derived tables rebuilt by `osmia refresh`: hourly rollups of good samples and stop events of
// run-status tags. Both are rebuilt only over the hours an import touched (dirty_hours).
import type { Queryable } from './queryable.ts';

export interface DirtyRange {
  tagId: number;
  from: Date;
  to: Date;
}

/**
 * Claim pending dirty ranges, merged by tag. SKIP LOCKED lets several refresh workers share the
 * queue; the claim is a delete inside the caller's transaction, so a crash gives the rows back.
 */
export async function claimDirtyRanges(q: Queryable): Promise<DirtyRange[]> {
  const { rows } = await q.query<{ tag_id: number; from: Date; to: Date }>(
    `with claimed as (
       delete from dirty_hours where ctid in (select ctid from dirty_hours for update skip locked)
       returning tag_id, from_hour, to_hour)
     select tag_id, min(from_hour) as "from", max(to_hour) as "to" from claimed group by tag_id order by tag_id`,
  );
  return rows.map((r) => ({ tagId: r.tag_id, from: r.from, to: r.to }));
}

/** Mark every hour of every tag that has samples as dirty (a full rebuild). */
export async function markAllDirty(q: Queryable): Promise<number> {
  const { rowCount } = await q.query(
    `insert into dirty_hours (tag_id, from_hour, to_hour)
     select tag_id, date_trunc('hour', min(from_ts)), date_trunc('hour', max(to_ts)) + interval '1 hour'
     from sample_coverage group by tag_id`,
  );
  return rowCount ?? 0;
}

/**
 * Recompute the hourly rollups of some tags over one range [from, to): good-quality samples only.
 * One statement for all the tags, so a range read through the BRIN index is read once.
 */
export async function rebuildHourly(q: Queryable, tagIds: number[], from: Date, to: Date): Promise<number> {
  await q.query(`delete from sample_hourly where tag_id = any($1) and hour >= $2 and hour < $3`, [tagIds, from, to]);
  const { rowCount } = await q.query(
    `insert into sample_hourly (tag_id, hour, n, mean, min, max, last, last_ts)
     select tag_id, date_trunc('hour', ts), count(*), avg(value), min(value), max(value),
            (array_agg(value order by ts desc))[1], max(ts)
     from samples where tag_id = any($1) and ts >= $2 and ts < $3 and (quality & 192) = 192
     group by tag_id, date_trunc('hour', ts)`,
    [tagIds, from, to],
  );
  return rowCount ?? 0;
}

export interface RunTag {
  tagId: number;
  assetId: number;
}

export async function runStatusTags(q: Queryable): Promise<Map<number, RunTag>> {
  const { rows } = await q.query<{ id: number; asset_id: number }>(`select id, asset_id from tags where quantity = 'run_status'`);
  return new Map(rows.map((r) => [r.id, { tagId: r.id, assetId: r.asset_id }]));
}

/**
 * Rebuild the stop events of a run-status tag over [from, to). A stop that begins before `from` and
 * runs into it is rebuilt whole, so the range first widens to the start of such a stop.
 */
export async function rebuildStops(q: Queryable, tag: RunTag, from: Date, to: Date): Promise<number> {
  const open = await q.query<{ from_ts: Date }>(
    `select from_ts from downtime_events where tag_id = $1 and from_ts < $2 and (to_ts is null or to_ts >= $2) order by from_ts limit 1`,
    [tag.tagId, from],
  );
  const start = open.rows[0]?.from_ts ?? from;
  // The state just before the range, and every change of state inside it (good samples only).
  const prior = await q.query<{ value: number }>(
    `select value from samples where tag_id = $1 and ts < $2 and ts >= $2 - interval '30 days' and (quality & 192) = 192 order by ts desc limit 1`,
    [tag.tagId, start],
  );
  const { rows } = await q.query<{ ts: Date; running: boolean }>(
    `select ts, running from (
       select ts, value >= 0.5 as running, lag(value >= 0.5) over (order by ts) as prev
       from samples where tag_id = $1 and ts >= $2 and ts < $3 and (quality & 192) = 192) s
     where prev is distinct from running order by ts`,
    [tag.tagId, start, to],
  );
  const stops: { from: Date; to: Date | null }[] = [];
  let stoppedAt: Date | null = prior.rows[0] && prior.rows[0].value < 0.5 ? start : null;
  let wasRunning: boolean | undefined = prior.rows[0] ? prior.rows[0].value >= 0.5 : undefined;
  for (const r of rows) {
    if (r.running === wasRunning) continue;
    if (!r.running) stoppedAt = r.ts;
    else if (stoppedAt) {
      stops.push({ from: stoppedAt, to: r.ts });
      stoppedAt = null;
    }
    wasRunning = r.running;
  }
  if (stoppedAt) {
    // Still stopped at the end of the range: closed by the next start after it, if any is stored.
    const next = await q.query<{ ts: Date }>(
      `select ts from samples where tag_id = $1 and ts >= $2 and value >= 0.5 and (quality & 192) = 192 order by ts limit 1`,
      [tag.tagId, to],
    );
    stops.push({ from: stoppedAt, to: next.rows[0]?.ts ?? null });
  }
  await q.query(`delete from downtime_events where tag_id = $1 and from_ts >= $2 and from_ts < $3`, [tag.tagId, start, to]);
  if (stops.length) {
    await q.query(
      `insert into downtime_events (asset_id, tag_id, from_ts, to_ts)
       select $1, $2, * from unnest($3::timestamptz[], $4::timestamptz[])
       on conflict (asset_id, from_ts) do update set to_ts = excluded.to_ts, tag_id = excluded.tag_id`,
      [tag.assetId, tag.tagId, stops.map((s) => s.from), stops.map((s) => s.to)],
    );
  }
  return stops.length;
}
