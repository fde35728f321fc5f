import { from as copyFrom } from 'pg-copy-streams';
import { pipeline } from 'node:stream/promises';
import { Readable } from 'node:stream';
import type { ImportKind, ImportStatus } from '#shared/schemas/enums.ts';
import type { ImportRecord, Reject } from '#shared/schemas/imports.ts';
import type { Queryable } from './queryable.ts';
import type pg from 'pg';

interface ImportRow {
  id: number;
  kind: ImportKind;
  site: string | null;
  file_name: string;
  sha256: string;
  actor: string;
  status: ImportStatus;
  rows_read: number;
  rows_inserted: number;
  rows_unchanged: number;
  rows_rejected: number;
  duration_ms: number;
  notes: Record<string, unknown>;
  error: string | null;
  started_at: Date;
}

const select = `select i.id, i.kind, s.code as site, i.file_name, i.sha256, i.actor, i.status, i.rows_read,
  i.rows_inserted, i.rows_unchanged, i.rows_rejected, i.duration_ms, i.notes, i.error, i.started_at
  from imports i left join sites s on s.id = i.site_id`;

export function toRecord(row: ImportRow, rejects: Reject[] = []): ImportRecord {
  const { rowsUpdated = 0, derivedRefreshed = false, ...notes } = row.notes as { rowsUpdated?: number; derivedRefreshed?: boolean };
  return {
    id: row.id,
    kind: row.kind,
    site: row.site,
    file: row.file_name,
    sha256: row.sha256,
    status: row.status,
    rowsRead: row.rows_read,
    rowsInserted: row.rows_inserted,
    rowsUpdated,
    rowsUnchanged: row.rows_unchanged,
    rowsRejected: row.rows_rejected,
    rejects,
    durationMs: row.duration_ms,
    actor: row.actor,
    startedAt: row.started_at.toISOString(),
    dryRun: false,
    notes,
    error: row.error,
    derivedRefreshed,
  };
}

/**
 * Mark every landed import not yet marked as included in the derived tables: refresh calls it in its
 * transaction just before it claims the queued hours, so an import counts as refreshed only when its
 * hours were queued before that claim (one landing in between is left unmarked, never marked early).
 */
export async function noteRefreshFailure(q: Queryable, id: number, message: string): Promise<void> {
  await q.query(`update imports set notes = notes || jsonb_build_object('refreshError', $2::text) where id = $1`, [id, message]);
}

/** The refresh after an import is part of the command: its time is added to the import's duration. */
export async function addImportDuration(q: Queryable, id: number, ms: number): Promise<void> {
  await q.query(`update imports set duration_ms = duration_ms + $2 where id = $1`, [id, ms]);
}

export async function markImportsRefreshed(q: Queryable): Promise<number> {
  const { rowCount } = await q.query(
    `update imports set notes = notes || '{"derivedRefreshed": true}'::jsonb
     where status in ('completed', 'partial') and not coalesce((notes->>'derivedRefreshed')::boolean, false)`,
  );
  return rowCount ?? 0;
}

export async function insertRunningImport(
  q: Queryable,
  values: { siteId: number | null; kind: ImportKind; fileName: string; sha256: string; actor: string; options: object },
): Promise<number> {
  // Insert and take the session lock in one statement, so no sweep can see the record unlocked.
  const { rows } = await q.query<{ id: number }>(
    `with ins as (insert into imports (site_id, kind, file_name, sha256, actor, status, options)
                  values ($1, $2, $3, $4, $5, 'running', $6) returning id)
     select id, pg_advisory_lock(2, id) from ins`,
    [values.siteId, values.kind, values.fileName, values.sha256, values.actor, values.options],
  );
  return rows[0].id;
}

export async function finishImport(
  q: Queryable,
  id: number,
  values: {
    sha256: string;
    siteId: number | null;
    status: ImportStatus;
    rowsRead: number;
    rowsInserted: number;
    rowsUnchanged: number;
    rowsRejected: number;
    durationMs: number;
    notes: object;
    error: string | null;
  },
): Promise<void> {
  await q.query(
    `update imports set site_id = $2, status = $3, rows_read = $4, rows_inserted = $5, rows_unchanged = $6, rows_rejected = $7,
       duration_ms = $8, notes = $9, error = $10, sha256 = $11, finished_at = now() where id = $1`,
    [id, values.siteId, values.status, values.rowsRead, values.rowsInserted, values.rowsUnchanged, values.rowsRejected, values.durationMs, values.notes, values.error, values.sha256],
  );
}

/** A landed (completed or partial) import of the same content, kind and site. */
export async function findLandedImport(q: Queryable, siteId: number | null, kind: ImportKind, sha256: string): Promise<number | undefined> {
  const { rows } = await q.query<{ id: number }>(
    `select id from imports where site_id is not distinct from $1 and kind = $2 and sha256 = $3 and status in ('completed', 'partial') limit 1`,
    [siteId, kind, sha256],
  );
  return rows[0]?.id;
}

/** Whether a landed import of this kind and site had a file with this fingerprint (see runImport). */
export async function hasLandedFingerprint(q: Queryable, siteId: number, kind: ImportKind, fingerprint: string): Promise<boolean> {
  const { rowCount } = await q.query(
    `select 1 from imports where site_id = $1 and kind = $2 and status in ('completed', 'partial') and options->>'fingerprint' = $3 limit 1`,
    [siteId, kind, fingerprint],
  );
  return (rowCount ?? 0) > 0;
}

/**
 * An import left 'running' by a process that died holds no lock any more: mark it failed.
 * (Each running import holds the session lock pg_advisory_lock(2, id) on its connection.)
 */
export async function sweepInterruptedImports(q: Queryable): Promise<number> {
  const { rowCount } = await q.query(
    `update imports set status = 'failed', error = 'interrupted: the importing process stopped before the end (nothing of the file was kept)', finished_at = now()
     where status = 'running' and pg_try_advisory_xact_lock(2, id)`,
  );
  return rowCount ?? 0;
}

export async function copyRejects(client: pg.PoolClient, importId: number, rejects: (Reject & { raw?: string })[]): Promise<void> {
  if (rejects.length === 0) return;
  const esc = (s: string) => s.replace(/\\/g, '\\\\').replace(/\t/g, '\\t').replace(/\n/g, '\\n').replace(/\r/g, '\\r');
  const lines = rejects.map((r) => `${importId}\t${r.line}\t${esc(r.reason)}\t${r.raw === undefined ? '\\N' : esc(r.raw)}\n`);
  await pipeline(Readable.from(lines), client.query(copyFrom('copy import_rejects (import_id, line, reason, raw) from stdin')));
}

export async function listImports(q: Queryable, filter: { kind?: ImportKind; limit: number }): Promise<ImportRecord[]> {
  const { rows } = await q.query<ImportRow>(`${select} where ($1::text is null or i.kind = $1) order by i.id desc limit $2`, [filter.kind ?? null, filter.limit]);
  return rows.map((r) => toRecord(r));
}

export async function getImport(q: Queryable, id: number, rejectLimit = 100): Promise<ImportRecord | undefined> {
  const { rows } = await q.query<ImportRow>(`${select} where i.id = $1`, [id]);
  if (!rows[0]) return undefined;
  const rejects = await q.query<Reject>(`select line, reason from import_rejects where import_id = $1 order by line, id limit $2`, [id, rejectLimit]);
  return toRecord(rows[0], rejects.rows);
}

export async function* streamRejects(q: Queryable, id: number): AsyncGenerator<{ line: number; reason: string; raw: string | null }[]> {
  let after = 0;
  for (;;) {
    const { rows } = await q.query<{ id: number; line: number; reason: string; raw: string | null }>(
      `select id, line, reason, raw from import_rejects where import_id = $1 and id > $2 order by id limit 5000`,
      [id, after],
    );
    if (rows.length === 0) return;
    after = rows[rows.length - 1].id;
    yield rows;
  }
}
