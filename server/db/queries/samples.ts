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
