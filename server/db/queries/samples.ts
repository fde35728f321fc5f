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
 * Write an import's hourly rollups of the tags in `tagIds` (inside the import's transaction). Those tags
 * are in time order and overlap no earlier import, so each hour appears once and only a tag's first and
 * last hour can already have a row — an earlier import's samples at the edge of this one's span. Those
 * edge hours are merged with what is there (counts and sums add; the mean is their ratio); every other
 * hour is new and goes straight in with COPY (a merge of 400,000 hours through an upsert took 4 s; the
 * plain COPY a fraction of that).
 */
export async function writeImportRollups(q: pg.PoolClient, r: RollupColumns, tagIds: ReadonlySet<number>): Promise<number> {
  const first = new Map<number, number>();
  const last = new Map<number, number>();
  for (let i = 0; i < r.tagIds.length; i++) {
    const tag = r.tagIds[i]!;
    if (!tagIds.has(tag)) continue;
    if (!first.has(tag)) first.set(tag, i);
    last.set(tag, i);
  }
  if (first.size === 0) return 0;
  const edges = new Set([...first.values(), ...last.values()]);
  await pipeline(Readable.from(binaryRollups(r, (i) => !edges.has(i) && tagIds.has(r.tagIds[i]!))), q.query(copyFrom('copy sample_hourly (tag_id, hour, n, mean, min, max, last_ts) from stdin with (format binary)')));
  const e = [...edges];
  await q.query(
    `insert into sample_hourly (tag_id, hour, n, mean, min, max, last_ts)
     select * from unnest($1::int[], $2::timestamptz[], $3::int[], $4::float8[], $5::float8[], $6::float8[], $7::timestamptz[])
     on conflict (tag_id, hour) do update set
       n = sample_hourly.n + excluded.n,
       mean = (sample_hourly.mean * sample_hourly.n + excluded.mean * excluded.n) / (sample_hourly.n + excluded.n),
       min = least(sample_hourly.min, excluded.min),
       max = greatest(sample_hourly.max, excluded.max),
       last_ts = greatest(sample_hourly.last_ts, excluded.last_ts)`,
    [
      e.map((i) => r.tagIds[i]),
      e.map((i) => new Date(r.hours[i]!)),
      e.map((i) => r.n[i]),
      e.map((i) => r.sums[i]! / r.n[i]!),
      e.map((i) => r.mins[i]),
      e.map((i) => r.maxs[i]),
      e.map((i) => new Date(r.lasts[i]!)),
    ],
  );
  return r.tagIds.filter((t) => tagIds.has(t)).length;
}

/** 2000-01-01T00:00:00Z, PostgreSQL's timestamp epoch, in Unix milliseconds. */
const pgEpochMs = 946_684_800_000;
/** Bytes of one rollup tuple in binary COPY: field count, then (length, data) for int4, timestamptz, int4, 3 × float8, timestamptz. */
const rollupTupleBytes = 2 + (4 + 4) + (4 + 8) + (4 + 4) + 3 * (4 + 8) + (4 + 8);

/**
 * The rollup rows `keep` selects, in PostgreSQL's binary COPY format ("COPY — Binary Format" in its
 * documentation), in chunks of about 256 kB: no timestamp or number text to build here or parse there.
 */
function* binaryRollups(r: RollupColumns, keep: (i: number) => boolean): Generator<Buffer> {
  const chunkRows = 3000;
  let b = Buffer.allocUnsafe(19 + chunkRows * rollupTupleBytes + 2);
  let p = b.write('PGCOPY\n\xff\r\n\0', 0, 'latin1');
  p = b.writeInt32BE(0, p);
  p = b.writeInt32BE(0, p);
  let rows = 0;
  const time = (ms: number) => {
    const micros = (ms - pgEpochMs) * 1000;
    const high = Math.floor(micros / 4294967296);
    p = b.writeInt32BE(8, p);
    p = b.writeInt32BE(high, p);
    p = b.writeUInt32BE(micros - high * 4294967296, p);
  };
  const float = (v: number) => {
    p = b.writeInt32BE(8, p);
    p = b.writeDoubleBE(v, p);
  };
  for (let i = 0; i < r.tagIds.length; i++) {
    if (!keep(i)) continue;
    p = b.writeInt16BE(7, p);
    p = b.writeInt32BE(4, p);
    p = b.writeInt32BE(r.tagIds[i]!, p);
    time(r.hours[i]!);
    p = b.writeInt32BE(4, p);
    p = b.writeInt32BE(r.n[i]!, p);
    float(r.sums[i]! / r.n[i]!);
    float(r.mins[i]!);
    float(r.maxs[i]!);
    time(r.lasts[i]!);
    if (++rows === chunkRows) {
      yield b.subarray(0, p);
      b = Buffer.allocUnsafe(chunkRows * rollupTupleBytes + 2);
      p = 0;
      rows = 0;
    }
  }
  p = b.writeInt16BE(-1, p);
  yield b.subarray(0, p);
}
