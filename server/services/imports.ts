import type { ImportRecord } from '#shared/schemas/imports.ts';
import type { Db } from '../db/client.ts';
import { getImport, listImports, streamRejects, sweepInterruptedImports } from '../db/queries/imports.ts';
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
 * Import one file; with `refreshAfterwards`, new historian samples are rolled up at once (the upload
 * page shows them right away; cron runs `osmia refresh` after its imports instead).
 */
export async function importFile(db: Db, opts: ImportOptions & { refreshAfterwards?: boolean }): Promise<ImportRecord> {
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
    if (opts.refreshAfterwards && record.kind === 'historian' && record.rowsInserted > 0 && !record.dryRun) await refresh(db);
    return record;
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

/** The rejects of an import as CSV lines (header first), streamed in pages. */
export async function* rejectsCsv(db: Db, id: number): AsyncGenerator<string> {
  if (!(await getImport(db.$client, id, 0))) throw notFound('import-not-found');
  const cell = (v: string | number | null) => {
    const s = v === null ? '' : String(v);
    // Quote every text cell; a leading = + - @ is prefixed so a spreadsheet shows it as text.
    return `"${(/^[=+\-@]/.test(s) ? `'${s}` : s).replace(/"/g, '""')}"`;
  };
  yield 'line,reason,row\r\n';
  for await (const page of streamRejects(db.$client, id)) {
    yield page.map((r) => `${r.line},${cell(r.reason)},${cell(r.raw)}\r\n`).join('');
  }
}
