// Building a workbook, for the CLI (`osmia report`), the API (GET /api/reports/<name>.xlsx) and the
// nightly run: validate the request, resolve the site and window, read every figure (the KPI catalog's
// answers and the rows under them), and only then write — so a bad site or window is an error before a
// single byte goes out, and a download streams as it is written.
import { createWriteStream } from 'node:fs';
import { mkdir, rename, rm } from 'node:fs/promises';
import { dirname, resolve } from 'node:path';
import type { Writable } from 'node:stream';
import { reportRequestSchema, type ReportName } from '#shared/schemas/reports.ts';
import type { Settings } from '#shared/schemas/settings.ts';
import type { Db } from '../db/client.ts';
import { catchUpDerived } from '../services/freshness.ts';
import { resolveSite } from '../services/scope.ts';
import { getSettings } from '../services/settings.ts';
import { Book } from './book.ts';
import { workbookNamed, type WorkbookDefinition } from './catalog.ts';
import { localDay, reportFileName, resolveReportWindow, type ReportWindow } from './window.ts';

export type ReportSheets = { name: string; rows: number }[];

/** A workbook whose figures are read, ready to be written (once) to a stream. */
export interface PreparedReport {
  name: ReportName;
  /** `<name>-<site>-<from>-<to>.xlsx`. */
  fileName: string;
  site: string;
  window: ReportWindow;
  /** The day it is built, YYYY-MM-DD in the site's zone: the reports/<date>/ folder it is stored in. */
  builtDay: string;
  write: (out: Writable) => Promise<ReportSheets>;
}

/**
 * Writes a workbook's content to `out` with the definition's writer. Exposed for the benchmark, which
 * writes content made in memory; everything else goes through `prepareReport`.
 */
export async function writeWorkbook<Content>(definition: WorkbookDefinition<Content>, content: Content, out: Writable, timeZone: string, created: Date): Promise<ReportSheets> {
  const book = await Book.open(out, timeZone, created);
  // A download whose reader went away ends here instead of waiting for a stream that will never finish.
  let closed!: (err: Error) => void;
  const gone = new Promise<never>((_, reject) => (closed = reject));
  gone.catch(() => undefined);
  const onClose = () => {
    if (!out.writableFinished) closed(new Error('the output closed before the workbook was written'));
  };
  out.once('close', onClose);
  try {
    return await Promise.race([definition.write(book, content).then(() => book.close()), gone]);
  } finally {
    out.off('close', onClose);
  }
}

/**
 * Reads everything a workbook shows. `raw` is checked with reportRequestSchema (a ZodError names the bad
 * field); an unknown site or an empty window is an HttpError. Settings are read here unless given.
 */
export async function prepareReport(db: Db, raw: unknown, settings?: Settings): Promise<PreparedReport> {
  const request = reportRequestSchema.parse(raw);
  const site = await resolveSite(db, request.site);
  const window = await resolveReportWindow(db, site, request);
  const definition = workbookNamed(request.name);
  const plant = settings ?? (await getSettings(db));
  // As GET /api/kpi/<name> does: a little imported data not yet rolled up is rolled up first.
  if (definition.readsDerived) await catchUpDerived(db);
  const generatedAt = new Date();
  const content = await definition.load({ db, site, window, settings: plant, generatedAt });
  return {
    name: request.name,
    fileName: reportFileName(request.name, site.code, window),
    site: site.code,
    builtDay: localDay(generatedAt, site.timeZone),
    window,
    write: (out) => writeWorkbook(definition, content, out, site.timeZone, generatedAt),
  };
}

/** The streaming variant, for GET /api/reports/<name>.xlsx: the workbook goes to `out` as it is written. */
export async function streamReport(db: Db, request: { name: ReportName; site?: string; from?: string; to?: string }, out: Writable, settings?: Settings): Promise<{ fileName: string; sheets: ReportSheets }> {
  const prepared = await prepareReport(db, request, settings);
  return { fileName: prepared.fileName, sheets: await prepared.write(out) };
}

/**
 * Writes a prepared workbook to `file` (folders made as needed). The file appears under its name only once
 * it is complete: it is written beside it and renamed, so a listing of reports/ never offers half a workbook.
 */
export async function writePreparedReport(prepared: PreparedReport, file: string): Promise<{ path: string; sheets: ReportSheets }> {
  const path = resolve(file);
  await mkdir(dirname(path), { recursive: true });
  const partial = `${path}.${process.pid}.partial`;
  try {
    const sheets = await prepared.write(createWriteStream(partial));
    await rename(partial, path);
    return { path, sheets };
  } catch (err) {
    await rm(partial, { force: true });
    throw err;
  }
}

/**
 * Writes a workbook to `file`, for the nightly run (`osmia report` prepares first, to name the file from
 * the resolved window). `reportFileName` gives the usual name for a request with both days.
 */
export async function writeReport(
  db: Db,
  request: { name: ReportName; site?: string; from?: string; to?: string },
  file: string,
  settings?: Settings,
): Promise<{ path: string; sheets: ReportSheets }> {
  return writePreparedReport(await prepareReport(db, request, settings), file);
}

export { reportFileName } from './window.ts';
export { workbooks, workbooksFor } from './catalog.ts';
