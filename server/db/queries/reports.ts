// Rows the workbooks list beside the KPI answers (server/reports/): the work orders behind a cost total,
// the import history and its rejects. Totals come from the KPI answers; these are
// the lines under them.
import type { Queryable } from './queryable.ts';

/** A closed work order's cost, with its asset, for the cost table by month, asset and type. */
export interface CostLine {
  woNumber: string;
  assetCode: string;
  assetName: string;
  type: string;
  completedAt: Date;
  labourHours: number;
  labourCost: number;
  partsCost: number;
}

/** The cost lines of the named work orders of a site (those a maintenance-mix answer counted), by completion. */
export async function listCostLines(q: Queryable, siteId: number, woNumbers: readonly string[]): Promise<CostLine[]> {
  if (woNumbers.length === 0) return [];
  const { rows } = await q.query<CostLine>(
    `select w.wo_number as "woNumber", a.code as "assetCode", a.name as "assetName", w.type, w.completed_at as "completedAt",
            w.labour_hours as "labourHours", w.labour_cost as "labourCost", w.parts_cost as "partsCost"
     from work_orders w join assets a on a.id = w.asset_id
     where w.site_id = $1 and w.wo_number = any($2::text[]) and w.completed_at is not null
     order by w.completed_at, w.wo_number`,
    [siteId, woNumbers],
  );
  return rows;
}

/** One import of a site, as the import history lists it. */
export interface ImportLine {
  id: number;
  kind: string;
  file: string;
  startedAt: Date;
  actor: string;
  status: string;
  rowsRead: number;
  rowsInserted: number;
  rowsUpdated: number;
  rowsUnchanged: number;
  rowsRejected: number;
  durationMs: number;
  error: string | null;
}

/** Every import of a site, newest first. */
export async function listSiteImports(q: Queryable, siteId: number): Promise<ImportLine[]> {
  const { rows } = await q.query<ImportLine>(
    `select id, kind, file_name as file, started_at as "startedAt", actor, status, rows_read as "rowsRead",
            rows_inserted as "rowsInserted", coalesce((notes->>'rowsUpdated')::int, 0) as "rowsUpdated",
            rows_unchanged as "rowsUnchanged", rows_rejected as "rowsRejected", duration_ms as "durationMs", error
     from imports where site_id = $1
     order by started_at desc, id desc`,
    [siteId],
  );
  return rows;
}

/** A rejected row of one of a site's imports, with the raw text of the line as it was read. */
export interface RejectLine {
  importId: number;
  file: string;
  line: number;
  reason: string;
  raw: string | null;
}

/** The rejected rows of a site's imports, newest import first, at most `limit` of them, and how many there are. */
export async function listSiteRejects(q: Queryable, siteId: number, limit: number): Promise<{ rows: RejectLine[]; total: number }> {
  const [list, count] = await Promise.all([
    q.query<RejectLine>(
      `select r.import_id as "importId", i.file_name as file, r.line, r.reason, r.raw
       from import_rejects r join imports i on i.id = r.import_id
       where i.site_id = $1
       order by i.started_at desc, i.id desc, r.line, r.id
       limit $2`,
      [siteId, limit],
    ),
    q.query<{ n: string }>(`select count(*) as n from import_rejects r join imports i on i.id = r.import_id where i.site_id = $1`, [siteId]),
  ]);
  return { rows: list.rows, total: Number(count.rows[0]?.n ?? 0) };
}
