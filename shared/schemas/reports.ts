// Spreadsheet workbooks (docs/design.md §7): which can be built, the window they are built for, what
// `osmia report --json` prints and what GET /api/reports lists. The workbooks themselves are written by
// server/reports/.
import { z } from 'zod';

import { codeQuerySchema, isoDateSchema, isoInstantSchema } from './common.ts';

export const reportNames = ['finance', 'manager', 'engineer'] as const;
export type ReportName = (typeof reportNames)[number];
export const reportNameSchema = z.enum(reportNames, { error: `the workbook is one of ${reportNames.join(', ')}` });

const dayMessage = (bound: 'from' | 'to') =>
  `${bound} must be a calendar date, YYYY-MM-DD (read as midnight in the site's time zone${bound === 'to' ? '; that day is not included' : ''})`;

/**
 * The window of a workbook: whole days in the site's zone, half-open [from, to). Without a bound the
 * window reaches the first (or last) day of the site's historian and work-order data, as a KPI without
 * bounds does. Days, not instants: they name the file (`finance-TFD-2025-01-01-2025-02-01.xlsx`).
 */
export const reportQuerySchema = z.object({
  site: codeQuerySchema.optional(),
  from: z.iso.date({ error: dayMessage('from') }).optional(),
  to: z.iso.date({ error: dayMessage('to') }).optional(),
});
export type ReportQuery = z.infer<typeof reportQuerySchema>;

/** One workbook to build: its name and window (what `writeReport` and the nightly run take). */
export const reportRequestSchema = reportQuerySchema.extend({ name: reportNameSchema });
export type ReportRequest = z.infer<typeof reportRequestSchema>;

/** What a written workbook holds: each sheet with the rows written to it (header, data, totals and notes). */
export const reportSheetsSchema = z.array(z.object({ name: z.string(), rows: z.number().int().nonnegative() }));

/** `osmia report <name> --json`: where the workbook was written and its sheets. */
export const reportResultSchema = z.object({ path: z.string(), sheets: reportSheetsSchema });
export type ReportResult = z.infer<typeof reportResultSchema>;

/** A folder of stored workbooks: the date the nightly run wrote it, `YYYY-MM-DD`. */
export const storedDateSchema = z
  .string()
  .regex(/^\d{4}-\d{2}-\d{2}$/, 'the folder is a date, YYYY-MM-DD')
  .pipe(isoDateSchema);

/**
 * A stored workbook's file name, `<name>-<site>-<from>-<to>.xlsx`: letters, digits, `_` and `-` only
 * (no dot but the extension's, no slash), so it can only name a file inside its folder.
 */
export const storedFileNamePattern = /^(finance|manager|engineer)-([A-Za-z0-9_-]{1,40})-(\d{4}-\d{2}-\d{2})-(\d{4}-\d{2}-\d{2})\.xlsx$/;
export const storedFileSchema = z.string().max(120).regex(storedFileNamePattern, 'the file is a workbook name, <name>-<site>-<from>-<to>.xlsx');

/** GET /api/reports/stored/:date/:file. */
export const storedReportParamsSchema = z.object({ date: storedDateSchema, file: storedFileSchema });

export const storedReportSchema = z.object({
  /** The folder under reports/: the day the nightly run wrote it. */
  date: isoDateSchema,
  file: z.string(),
  name: reportNameSchema,
  site: z.string(),
  from: isoDateSchema,
  to: isoDateSchema,
  bytes: z.number().int().nonnegative(),
  modifiedAt: isoInstantSchema,
  /** Where to download it (GET /api/reports/stored/:date/:file). */
  url: z.string(),
});
export type StoredReport = z.infer<typeof storedReportSchema>;

export const reportWorkbookSchema = z.object({
  name: reportNameSchema,
  title: z.string(),
  description: z.string(),
  /** GET /api/reports/<name>.xlsx; add site, from and to as query parameters. */
  url: z.string(),
});
export type ReportWorkbook = z.infer<typeof reportWorkbookSchema>;

/** GET /api/reports: the workbooks the caller's role may build, and the stored ones it may download, newest first. */
export const reportListSchema = z.object({
  workbooks: z.array(reportWorkbookSchema),
  stored: z.array(storedReportSchema),
});
export type ReportList = z.infer<typeof reportListSchema>;
