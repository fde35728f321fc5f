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

/** A job step with the work-order facts time-to-complete groups by. */
export interface JobStepWithOrder extends Omit<JobStepValues, 'workOrderId'> {
  woNumber: string;
  type: string;
  failureCode: string | null;
  description: string;
  crew: string | null;
  assetCode: string;
  assetKind: string;
}

/**
 * Every step of the jobs (work orders with steps) on the given assets whose FIRST step started in
 * [from, to) (a null bound is open), with the work order's type, failure code, description, crew
 * and asset. A job is kept or dropped whole, so its duration is never cut by the window.
 */
export async function listJobStepsWithOrders(
  q: Queryable,
  siteId: number,
  assetIds: readonly number[],
  from: Date | null,
  to: Date | null,
): Promise<JobStepWithOrder[]> {
  if (assetIds.length === 0) return [];
  const { rows } = await q.query<JobStepWithOrder>(
    `with jobs as (
       select s.work_order_id
       from job_steps s join work_orders w on w.id = s.work_order_id
       where w.site_id = $1 and w.asset_id = any($2::int[])
       group by s.work_order_id
       having ($3::timestamptz is null or min(s.started_at) >= $3) and ($4::timestamptz is null or min(s.started_at) < $4))
     select w.wo_number as "woNumber", s.step, s.name, s.started_at as "startedAt", s.completed_at as "completedAt",
            s.guided, s.technician, w.type, w.failure_code as "failureCode", w.description, w.crew,
            a.code as "assetCode", a.kind as "assetKind"
     from jobs j
     join job_steps s on s.work_order_id = j.work_order_id
     join work_orders w on w.id = s.work_order_id
     join assets a on a.id = w.asset_id
     order by w.wo_number, s.step`,
    [siteId, assetIds, from, to],
  );
  return rows;
}
