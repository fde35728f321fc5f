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
