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

/**
 * Tags whose asset or quantity changed (a tag-map import): their stop events go (they may name the old
 * asset, or no longer be of a run-status tag) and every hour they have samples for is queued, so the
 * next refresh rebuilds their rollups and stops under the new mapping.
 */
export async function markTagsDirty(q: Queryable, tagIds: readonly number[]): Promise<void> {
  if (tagIds.length === 0) return;
  await q.query(`delete from downtime_events where tag_id = any($1::int[])`, [tagIds]);
  await q.query(
    `insert into dirty_hours (tag_id, from_hour, to_hour)
     select tag_id, date_trunc('hour', min(from_ts)), date_trunc('hour', max(to_ts)) + interval '1 hour'
     from sample_coverage where tag_id = any($1::int[]) group by tag_id`,
    [tagIds],
  );
}

/** Whether any hours wait for refresh. */
export async function hasDirtyHours(q: Queryable): Promise<boolean> {
  const { rows } = await q.query<{ any: boolean }>(`select exists (select 1 from dirty_hours) as any`);
  return rows[0]!.any;
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
    `insert into sample_hourly (tag_id, hour, n, mean, min, max, last_ts)
     select tag_id, date_trunc('hour', ts), count(*), avg(value), min(value), max(value), max(ts)
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
 * Rebuild the stop events of run-status tags over [from, to), in one pass over the range for all of
 * them. A stop that begins before `from` and runs into it is rebuilt whole: each tag's range first
 * widens to the start of such a stop. Returns the number of stops written.
 */
export async function rebuildStops(q: Queryable, tags: RunTag[], from: Date, to: Date): Promise<number> {
  if (tags.length === 0) return 0;
  const ids = tags.map((t) => t.tagId);
  const open = await q.query<{ tag_id: number; from_ts: Date }>(
    `select distinct on (tag_id) tag_id, from_ts from downtime_events
     where tag_id = any($1) and from_ts < $2 and (to_ts is null or to_ts >= $2) order by tag_id, from_ts`,
    [ids, from],
  );
  const startOf = new Map(open.rows.map((r) => [r.tag_id, r.from_ts]));
  const start = new Date(Math.min(from.getTime(), ...open.rows.map((r) => r.from_ts.getTime())));
  // The state of each tag just before its range: its last good sample, looked for an hour back, then
  // a day, then 30 days (the BRIN index reads only those blocks, so the usual case costs an hour's rows).
  const priorOf = new Map<number, boolean>();
  for (const lookback of ['1 hour', '1 day', '30 days']) {
    const missing = ids.filter((id) => !priorOf.has(id));
    if (missing.length === 0) break;
    const prior = await q.query<{ tag_id: number; value: number }>(
      `select distinct on (tag_id) tag_id, value from samples
       where tag_id = any($1) and ts < $2 and ts >= $3::timestamptz - $4::interval and (quality & 192) = 192
       order by tag_id, ts desc`,
      [missing, from, start, lookback],
    );
    for (const r of prior.rows) priorOf.set(r.tag_id, r.value >= 0.5);
  }
  // Every change of state inside the range, all tags in one scan.
  const { rows } = await q.query<{ tag_id: number; ts: Date; running: boolean }>(
    `select tag_id, ts, running from (
       select tag_id, ts, value >= 0.5 as running, lag(value >= 0.5) over (partition by tag_id order by ts) as prev
       from samples where tag_id = any($1) and ts >= $2 and ts < $3 and (quality & 192) = 192) s
     where prev is distinct from running order by tag_id, ts`,
    [ids, start, to],
  );
  const changes = new Map<number, { ts: Date; running: boolean }[]>();
  for (const r of rows) (changes.get(r.tag_id) ?? changes.set(r.tag_id, []).get(r.tag_id)!).push(r);

  const written: { assetId: number; tagId: number; from: Date; to: Date | null }[] = [];
  const stillStopped: number[] = [];
  for (const tag of tags) {
    const tagStart = startOf.get(tag.tagId) ?? from;
    let wasRunning = startOf.has(tag.tagId) ? false : priorOf.get(tag.tagId);
    let stoppedAt: Date | null = wasRunning === false ? tagStart : null;
    for (const c of changes.get(tag.tagId) ?? []) {
      if (c.ts < tagStart || c.running === wasRunning) continue;
      if (!c.running) stoppedAt = c.ts;
      else if (stoppedAt) {
        written.push({ assetId: tag.assetId, tagId: tag.tagId, from: stoppedAt, to: c.ts });
        stoppedAt = null;
      }
      wasRunning = c.running;
    }
    if (stoppedAt) {
      written.push({ assetId: tag.assetId, tagId: tag.tagId, from: stoppedAt, to: null });
      stillStopped.push(written.length - 1);
    }
  }
  // A stop still open at the end of the range ends at the tag's next start after it, if one is stored.
  for (const i of stillStopped) {
    const next = await q.query<{ ts: Date }>(
      `select ts from samples where tag_id = $1 and ts >= $2 and ts < $2::timestamptz + interval '30 days' and value >= 0.5 and (quality & 192) = 192 order by ts limit 1`,
      [written[i].tagId, to],
    );
    written[i].to = next.rows[0]?.ts ?? null;
  }
  for (const tag of tags) {
    await q.query(`delete from downtime_events where tag_id = $1 and from_ts >= $2 and from_ts < $3`, [tag.tagId, startOf.get(tag.tagId) ?? from, to]);
  }
  if (written.length) {
    await q.query(
      `insert into downtime_events (asset_id, tag_id, from_ts, to_ts)
       select * from unnest($1::int[], $2::int[], $3::timestamptz[], $4::timestamptz[])
       on conflict (asset_id, from_ts) do update set to_ts = excluded.to_ts, tag_id = excluded.tag_id`,
      [written.map((w) => w.assetId), written.map((w) => w.tagId), written.map((w) => w.from), written.map((w) => w.to)],
    );
  }
  return written.length;
}
