import type { Queryable } from './queryable.ts';

export interface JobStepValues {
  workOrderId: number;
  step: number;
  name: string;
  startedAt: Date;
  completedAt: Date;
  guided: boolean;
  technician: string | null;
}

export async function listJobStepValues(q: Queryable, siteId: number): Promise<JobStepValues[]> {
  const { rows } = await q.query<JobStepValues>(
    `select s.work_order_id as "workOrderId", s.step, s.name, s.started_at as "startedAt", s.completed_at as "completedAt",
            s.guided, s.technician
     from job_steps s join work_orders w on w.id = s.work_order_id where w.site_id = $1`,
    [siteId],
  );
  return rows;
}

export async function upsertJobSteps(q: Queryable, importId: number | null, rows: JobStepValues[]): Promise<void> {
  for (let i = 0; i < rows.length; i += 5000) {
    const chunk = rows.slice(i, i + 5000);
    const col = <K extends keyof JobStepValues>(k: K) => chunk.map((r) => r[k]);
    await q.query(
      `insert into job_steps (import_id, work_order_id, step, name, started_at, completed_at, guided, technician)
       select $1, * from unnest($2::int[], $3::int[], $4::text[], $5::timestamptz[], $6::timestamptz[], $7::bool[], $8::text[])
       on conflict (work_order_id, step) do update set import_id = excluded.import_id, name = excluded.name,
         started_at = excluded.started_at, completed_at = excluded.completed_at, guided = excluded.guided,
         technician = excluded.technician`,
      [importId, col('workOrderId'), col('step'), col('name'), col('startedAt'), col('completedAt'), col('guided'), col('technician')],
    );
  }
}

/**
 * Recompute job_spans for the given work orders (null: every job) from their steps: the reduction of
 * shared/kpi/time-to-complete.ts `jobSpansOf` — min start, max end, any guided, step count — in SQL.
 * Called in the transaction that changed the steps, so spans never disagree with them.
 */
export async function rebuildJobSpans(q: Queryable, workOrderIds: readonly number[] | null): Promise<number> {
  if (workOrderIds !== null && workOrderIds.length === 0) return 0;
  await q.query(`delete from job_spans where $1::int[] is null or work_order_id = any($1::int[])`, [workOrderIds]);
  const { rowCount } = await q.query(
    `insert into job_spans (work_order_id, first_start, last_end, guided, steps)
     select work_order_id, min(started_at), max(completed_at), bool_or(guided), count(*)::int from job_steps
     where $1::int[] is null or work_order_id = any($1::int[]) group by work_order_id`,
    [workOrderIds],
  );
  return rowCount ?? 0;
}

/** A job (a work order with steps) reduced to its span, with the work-order facts time-to-complete groups by. */
export interface JobSpanWithOrder {
  woNumber: string;
  /** First step's start and last step's end. */
  startedAt: Date;
  completedAt: Date;
  /** Any step done with the written procedure open. */
  guided: boolean;
  steps: number;
  type: string;
  crew: string | null;
  assetKind: string;
}

/**
 * The jobs on the given assets (null: every asset of the site) whose FIRST step started in
 * [from, to) (a null bound is open), each reduced to its span (job_spans: `rebuildJobSpans`), with
 * the work order's type, crew and asset kind. A job is kept or dropped whole, so its duration is
 * never cut by the window. Times come as epoch milliseconds (a number parses faster than a timestamp
 * text); the statement is prepared, so a dashboard's repeated question is parsed once per connection.
 */
export async function listJobSpans(
  q: Queryable,
  siteId: number,
  assetIds: readonly number[] | null,
  from: Date | null,
  to: Date | null,
): Promise<JobSpanWithOrder[]> {
  if (assetIds !== null && assetIds.length === 0) return [];
  const { rows } = await q.query<Omit<JobSpanWithOrder, 'startedAt' | 'completedAt'> & { startedMs: number; completedMs: number }>({
    name: 'job-spans',
    text: `select w.wo_number as "woNumber", extract(epoch from j.first_start)::float8 * 1000 as "startedMs",
              extract(epoch from j.last_end)::float8 * 1000 as "completedMs", j.guided, j.steps, w.type, w.crew, a.kind as "assetKind"
       from job_spans j join work_orders w on w.id = j.work_order_id join assets a on a.id = w.asset_id
       where w.site_id = $1 and ($2::int[] is null or w.asset_id = any($2::int[]))
         and ($3::timestamptz is null or j.first_start >= $3) and ($4::timestamptz is null or j.first_start < $4)`,
    values: [siteId, assetIds, from, to],
  });
  return rows.map((r) => ({
    woNumber: r.woNumber,
    startedAt: new Date(r.startedMs),
    completedAt: new Date(r.completedMs),
    guided: r.guided,
    steps: r.steps,
    type: r.type,
    crew: r.crew,
    assetKind: r.assetKind,
  }));
}
