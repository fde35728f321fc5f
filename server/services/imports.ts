import type { ImportRecord } from '#shared/schemas/imports.ts';
import { csvRecord } from '../csv.ts';
import type { Db } from '../db/client.ts';
import { addImportDuration, getImport, listImports, noteRefreshFailure, streamRejects, sweepInterruptedImports } from '../db/queries/imports.ts';
import { notFound } from '../errors.ts';
import { runImport, type ImportOptions } from '../importers/run.ts';
import { refresh } from '../jobs/refresh.ts';

export interface ImportProgress {
  bytesRead: number;
  totalBytes: number;
  rowsRead: number;
}

/** Progress of the imports this process is running, by import id (the record says 'running'). */
const running = new Map<number, ImportProgress>();

/**
 * Import one file and bring what is derived from it up to date: the one import path of `osmia import`,
 * POST /api/imports and `osmia seed`. Once the file has landed, the hours it touched are rebuilt
 * (rollups, stop events: incremental, tens of milliseconds for a day of a plant's samples) before the
 * record is returned, so a KPI asked right after counts the new data. `refresh: false` leaves that to one
 * `osmia refresh` after a bulk load of many files; the record's `derivedRefreshed` says which happened.
 * A refresh that fails does not undo the import: the record keeps `derivedRefreshed: false` with the
 * reason in `notes.refreshError`, and KPI answers warn until a refresh succeeds.
 */
export async function importFile(db: Db, opts: ImportOptions & { refresh?: boolean }): Promise<ImportRecord> {
  let id: number | undefined;
  try {
    const record = await runImport(db, {
      ...opts,
      onStart: (importId) => {
        id = importId;
        running.set(importId, { bytesRead: 0, totalBytes: 0, rowsRead: 0 });
      },
      onProgress: (p) => {
        if (id !== undefined) running.set(id, p);
        opts.onProgress?.(p);
      },
    });
    const landed = record.id !== null && (record.status === 'completed' || record.status === 'partial');
    if (!landed || opts.refresh === false) return record;
    const t0 = Date.now();
    try {
      await refresh(db);
    } catch (err) {
      await noteRefreshFailure(db.$client, record.id!, (err as Error).message);
    }
    await addImportDuration(db.$client, record.id!, Date.now() - t0);
    return (await getImport(db.$client, record.id!))!;
  } finally {
    if (id !== undefined) running.delete(id);
  }
}

export async function importHistory(db: Db, filter: Parameters<typeof listImports>[1]) {
  await sweepInterruptedImports(db.$client);
  const list = await listImports(db.$client, filter);
  return list.map(({ rejects: _r, ...rest }) => ({ ...rest, progress: rest.id !== null ? (running.get(rest.id) ?? null) : null }));
}

export async function importDetail(db: Db, id: number) {
  const record = await getImport(db.$client, id);
  if (!record) throw notFound('import-not-found');
  return { ...record, progress: running.get(id) ?? null };
}

/** The rejects of an import as CSV lines (header first), streamed in pages; text neutralised against formulas (server/csv.ts). */
export async function* rejectsCsv(db: Db, id: number): AsyncGenerator<string> {
  if (!(await getImport(db.$client, id, 0))) throw notFound('import-not-found');
  yield 'line,reason,row\r\n';
  for await (const page of streamRejects(db.$client, id)) {
    yield page.map((r) => csvRecord([r.line, r.reason, r.raw])).join('');
  }
}
