import { Readable } from 'node:stream';
import { pipeline } from 'node:stream/promises';
import { from as copyFrom } from 'pg-copy-streams';
import type pg from 'pg';
import type { Queryable } from './queryable.ts';

export interface TagSpan {
  tagId: number;
  from: Date;
  to: Date;
  rows: number;
}

/** This transaction's id as it appears in xmin (xid8 folded to 32 bits). */
export async function currentXid(q: Queryable): Promise<string> {
  const { rows } = await q.query<{ xid: string }>(`select (pg_current_xact_id()::text::bigint % 4294967296)::text as xid`);
  return rows[0].xid;
}

/** Tags among `spans` whose span overlaps samples an earlier import brought. */
export async function tagsWithOverlap(q: Queryable, spans: TagSpan[]): Promise<number[]> {
  if (spans.length === 0) return [];
  const { rows } = await q.query<{ tag_id: number }>(
    `select distinct c.tag_id from sample_coverage c
     join unnest($1::int[], $2::timestamptz[], $3::timestamptz[]) r(tag, a, b)
       on c.tag_id = r.tag and c.from_ts <= r.b and c.to_ts >= r.a`,
    [spans.map((s) => s.tagId), spans.map((s) => s.from), spans.map((s) => s.to)],
  );
  return rows.map((r) => r.tag_id);
}

/**
 * Remove the samples this transaction inserted that repeat a (tag, ts) already present — from an
 * earlier import, or earlier in the same file. The older row always stays. Returns removals by tag.
 */
export async function deleteRepeatedSamples(q: Queryable, xid: string, spans: TagSpan[]): Promise<Map<number, number>> {
  if (spans.length === 0) return new Map();
  const from = new Date(Math.min(...spans.map((s) => s.from.getTime())));
  const to = new Date(Math.max(...spans.map((s) => s.to.getTime())));
  const { rows } = await q.query<{ tag_id: number; n: number }>(
    `with r as (select * from unnest($1::int[], $2::timestamptz[], $3::timestamptz[]) as r(tag, a, b)),
     cand as (
       select s.ctid as c, s.xmin::text = $4 as mine,
              row_number() over (partition by s.tag_id, s.ts order by s.xmin::text = $4, s.ctid) as rn
       from samples s join r on s.tag_id = r.tag and s.ts between r.a and r.b
       where s.ts between $5 and $6
     ),
     del as (delete from samples s using cand where s.ctid = cand.c and cand.rn > 1 and cand.mine returning s.tag_id)
     select tag_id, count(*)::int as n from del group by tag_id`,
    [spans.map((s) => s.tagId), spans.map((s) => s.from), spans.map((s) => s.to), xid, from, to],
  );
  return new Map(rows.map((r) => [r.tag_id, r.n]));
}

export async function insertCoverage(q: Queryable, importId: number, spans: TagSpan[]): Promise<void> {
  if (spans.length === 0) return;
  await q.query(
    `insert into sample_coverage (import_id, tag_id, from_ts, to_ts, rows)
     select $1, * from unnest($2::int[], $3::timestamptz[], $4::timestamptz[], $5::int[])`,
    [importId, spans.map((s) => s.tagId), spans.map((s) => s.from), spans.map((s) => s.to), spans.map((s) => s.rows)],
  );
}

/** Mark the hours an import touched, for `osmia refresh` to rebuild. */
export async function markDirtyHours(q: Queryable, spans: TagSpan[]): Promise<void> {
  if (spans.length === 0) return;
  await q.query(
    `insert into dirty_hours (tag_id, from_hour, to_hour)
     select tag, date_trunc('hour', a), date_trunc('hour', b) + interval '1 hour'
     from unnest($1::int[], $2::timestamptz[], $3::timestamptz[]) as r(tag, a, b)`,
    [spans.map((s) => s.tagId), spans.map((s) => s.from), spans.map((s) => s.to)],
  );
}

/**
 * Summarize the BRIN block ranges new rows filled. Until a range is summarized every scan of the
 * index reads it, so without this a time-range query after a large import reads the whole table.
 */
export async function summarizeNewSamples(q: Queryable): Promise<number> {
  const { rows } = await q.query<{ n: number }>(`select brin_summarize_new_values('samples_ts_brin')::int as n`);
  return rows[0].n;
}

/** Partial hourly rollups of good samples, column by column (one entry per tag and partial hour). */
export interface RollupColumns {
  tagIds: readonly number[];
  hours: readonly number[];
  n: readonly number[];
  sums: readonly number[];
  mins: readonly number[];
  maxs: readonly number[];
  lasts: readonly number[];
}

/**
 * Write an import's hourly rollups of the tags in `tagIds` (inside the import's transaction): partial
 * hours of a tag are added up, and an hour that already has a row — an earlier import's samples at the
 * edge of this one's span — is merged with it (counts and sums add; the mean is their ratio). Streamed
 * with COPY into a temporary table, then one insert-select.
 */
export async function writeImportRollups(q: pg.PoolClient, r: RollupColumns, tagIds: ReadonlySet<number>): Promise<number> {
  const rows: number[] = [];
  for (let i = 0; i < r.tagIds.length; i++) if (tagIds.has(r.tagIds[i]!)) rows.push(i);
  if (rows.length === 0) return 0;
  await q.query(`create temporary table if not exists import_rollups (tag_id int, hour timestamptz, n int, s float8, mn float8, mx float8, last_ts timestamptz) on commit drop`);
  const lines = function* () {
    const iso = (ms: number) => new Date(ms).toISOString();
    for (let start = 0; start < rows.length; start += 5000) {
      let chunk = '';
      for (const i of rows.slice(start, start + 5000)) {
        chunk += `${r.tagIds[i]}\t${iso(r.hours[i]!)}\t${r.n[i]}\t${r.sums[i]}\t${r.mins[i]}\t${r.maxs[i]}\t${iso(r.lasts[i]!)}\n`;
      }
      yield chunk;
    }
  };
  await pipeline(Readable.from(lines()), q.query(copyFrom('copy import_rollups from stdin')));
  const { rowCount } = await q.query(
    `insert into sample_hourly (tag_id, hour, n, mean, min, max, last_ts)
     select tag_id, hour, sum(n), sum(s) / sum(n), min(mn), max(mx), max(last_ts) from import_rollups group by tag_id, hour
     on conflict (tag_id, hour) do update set
       n = sample_hourly.n + excluded.n,
       mean = (sample_hourly.mean * sample_hourly.n + excluded.mean * excluded.n) / (sample_hourly.n + excluded.n),
       min = least(sample_hourly.min, excluded.min),
       max = greatest(sample_hourly.max, excluded.max),
       last_ts = greatest(sample_hourly.last_ts, excluded.last_ts)`,
  );
  await q.query('truncate import_rollups');
  return rowCount ?? 0;
}
