// What changed on a site since a recipient's last digest (server/mail/digest.ts): imports that finished,
// and the failure work orders those imports wrote.
import type { ImportKind, ImportStatus } from '#shared/schemas/enums.ts';
import type { Queryable } from './queryable.ts';

export interface FinishedImport {
  id: number;
  kind: ImportKind;
  file: string;
  status: ImportStatus;
  rowsInserted: number;
  rowsRejected: number;
  finishedAt: Date;
}

/** Imports of the site (or, failed before their site was known, of none) that finished after `since`; duplicates left out. */
export async function importsFinishedSince(q: Queryable, siteId: number, since: Date): Promise<FinishedImport[]> {
  const { rows } = await q.query<FinishedImport>(
    `select id, kind, file_name as file, status, rows_inserted as "rowsInserted", rows_rejected as "rowsRejected", finished_at as "finishedAt"
       from imports
      where (site_id = $1 or site_id is null) and finished_at > $2 and status in ('completed', 'partial', 'failed')
      order by id`,
    [siteId, since],
  );
  return rows;
}

export interface RecordedFailure {
  woNumber: string;
  asset: string;
  failureCode: string;
  reportedAt: Date;
}

/**
 * Failures (docs/design.md §6: corrective, with a failure code, not cancelled) written or changed by an
 * import that finished after `since`.
 */
export async function failuresRecordedSince(q: Queryable, siteId: number, since: Date): Promise<RecordedFailure[]> {
  const { rows } = await q.query<RecordedFailure>(
    `select w.wo_number as "woNumber", a.code as asset, w.failure_code as "failureCode", w.reported_at as "reportedAt"
       from work_orders w join assets a on a.id = w.asset_id join imports i on i.id = w.import_id
      where w.site_id = $1 and w.type = 'corrective' and w.failure_code is not null and w.status <> 'cancelled' and i.finished_at > $2
      order by w.reported_at, w.wo_number`,
    [siteId, since],
  );
  return rows;
}
