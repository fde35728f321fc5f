import type { WorkOrderRecord } from '#shared/kpi/work-orders.ts';
import type { Queryable } from './queryable.ts';

/**
 * A work order as the table holds it: the shared WorkOrderRecord with its asset's id in place of its code,
 * and type, priority and status as the text the table's checks hold to shared/schemas/enums.ts.
 */
export type WorkOrderValues = Omit<WorkOrderRecord, 'asset' | 'type' | 'priority' | 'status'> & {
  assetId: number;
  type: string;
  priority: string;
  status: string;
};

/** The columns of a work order as WorkOrderValues (plus id), for every query below. */
const workOrderColumns = `id, wo_number as "woNumber", asset_id as "assetId", type, priority, status, failure_code as "failureCode",
  description, reported_at as "reportedAt", started_at as "startedAt", completed_at as "completedAt",
  out_of_service_from as "outOfServiceFrom", out_of_service_to as "outOfServiceTo",
  labour_hours as "labourHours", labour_cost as "labourCost", parts_cost as "partsCost", crew`;

export async function listWorkOrderValues(q: Queryable, siteId: number): Promise<(WorkOrderValues & { id: number })[]> {
  const { rows } = await q.query<WorkOrderValues & { id: number }>(
    `select ${workOrderColumns}
     from work_orders where site_id = $1`,
    [siteId],
  );
  return rows;
}

export async function upsertWorkOrders(q: Queryable, siteId: number, importId: number | null, rows: WorkOrderValues[]): Promise<void> {
  for (let i = 0; i < rows.length; i += 5000) {
    const chunk = rows.slice(i, i + 5000);
    const col = <K extends keyof WorkOrderValues>(k: K) => chunk.map((r) => r[k]);
    await q.query(
      `insert into work_orders (site_id, import_id, wo_number, asset_id, type, priority, status, failure_code, description,
         reported_at, started_at, completed_at, out_of_service_from, out_of_service_to, labour_hours, labour_cost, parts_cost, crew)
       select $1, $2, * from unnest($3::text[], $4::int[], $5::text[], $6::text[], $7::text[], $8::text[], $9::text[],
         $10::timestamptz[], $11::timestamptz[], $12::timestamptz[], $13::timestamptz[], $14::timestamptz[],
         $15::float8[], $16::float8[], $17::float8[], $18::text[])
       on conflict (site_id, wo_number) do update set import_id = excluded.import_id, asset_id = excluded.asset_id,
         type = excluded.type, priority = excluded.priority, status = excluded.status, failure_code = excluded.failure_code,
         description = excluded.description, reported_at = excluded.reported_at, started_at = excluded.started_at,
         completed_at = excluded.completed_at, out_of_service_from = excluded.out_of_service_from,
         out_of_service_to = excluded.out_of_service_to, labour_hours = excluded.labour_hours,
         labour_cost = excluded.labour_cost, parts_cost = excluded.parts_cost, crew = excluded.crew`,
      [
        siteId,
        importId,
        col('woNumber'),
        col('assetId'),
        col('type'),
        col('priority'),
        col('status'),
        col('failureCode'),
        col('description'),
        col('reportedAt'),
        col('startedAt'),
        col('completedAt'),
        col('outOfServiceFrom'),
        col('outOfServiceTo'),
        col('labourHours'),
        col('labourCost'),
        col('partsCost'),
        col('crew'),
      ],
    );
  }
}

type WorkOrderRow = WorkOrderValues & { id: number };

/** Work orders of the site on the given assets that also meet `condition` ($3… are `params`), by number. */
async function listOnAssets(q: Queryable, siteId: number, assetIds: readonly number[], condition: string, params: unknown[]): Promise<WorkOrderRow[]> {
  if (assetIds.length === 0) return [];
  const { rows } = await q.query<WorkOrderRow>(
    `select ${workOrderColumns} from work_orders
     where site_id = $1 and asset_id = any($2::int[]) and (${condition})
     order by wo_number`,
    [siteId, assetIds, ...params],
  );
  return rows;
}

/**
 * Work orders on the given assets that matter to a window [from, to): reported before `to` and not
 * completed before `from` (every order raised, worked, completed or still open in the window).
 */
export function listWorkOrdersOpenDuring(q: Queryable, siteId: number, assetIds: readonly number[], from: Date, to: Date): Promise<WorkOrderRow[]> {
  return listOnAssets(q, siteId, assetIds, 'reported_at < $4 and (completed_at is null or completed_at >= $3)', [from, to]);
}

/** Work orders on the given assets open at `at`: not cancelled, reported before it, not completed before it. */
export function listWorkOrdersOpenAt(q: Queryable, siteId: number, assetIds: readonly number[], at: Date): Promise<WorkOrderRow[]> {
  return listOnAssets(q, siteId, assetIds, "status <> 'cancelled' and reported_at < $3 and (completed_at is null or completed_at >= $3)", [at]);
}

/**
 * Work orders on the given assets that a reliability or downtime window [from, to) reads: reported in it
 * (failures are placed by reported_at) or out of service during it (downtime, calendar operating time).
 */
export function listWorkOrdersReportedOrOutOfServiceIn(
  q: Queryable,
  siteId: number,
  assetIds: readonly number[],
  from: Date,
  to: Date,
): Promise<WorkOrderRow[]> {
  return listOnAssets(q, siteId, assetIds, '(reported_at >= $3 and reported_at < $4) or (out_of_service_from < $4 and out_of_service_to > $3)', [from, to]);
}

/** Preventive work orders on the given assets reported before `to`: the candidates for cleanings. */
export function listPreventiveWorkOrders(q: Queryable, siteId: number, assetIds: readonly number[], to: Date): Promise<WorkOrderRow[]> {
  return listOnAssets(q, siteId, assetIds, "type = 'preventive' and reported_at < $3", [to]);
}

/** Every work order of the site reported in [from, to), by reported time then number. */
export async function listWorkOrdersReportedIn(q: Queryable, siteId: number, from: Date, to: Date): Promise<WorkOrderRow[]> {
  const { rows } = await q.query<WorkOrderRow>(
    `select ${workOrderColumns} from work_orders
     where site_id = $1 and reported_at >= $2 and reported_at < $3
     order by reported_at, wo_number`,
    [siteId, from, to],
  );
  return rows;
}
