// The window of a workbook: whole days in the site's zone, [from, to), each KPI asked with the same two
// days, so every sheet is about the same stretch of time as the API's answers for those days.
import { TZDate } from '@date-fns/tz';
import type { ReportName, ReportQuery } from '#shared/schemas/reports.ts';
import type { Db } from '../db/client.ts';
import type { SiteRow } from '../db/queries/sites.ts';
import { badRequest } from '../errors.ts';
import { dataExtent, resolveBound } from '../services/scope.ts';

export interface ReportWindow {
  /** First day, YYYY-MM-DD (midnight in the site's zone, included). */
  fromDay: string;
  /** Day after the last, YYYY-MM-DD (midnight in the site's zone, not included). */
  toDay: string;
  from: Date;
  to: Date;
}

/** The calendar day in `timeZone` of an instant, YYYY-MM-DD. */
export function localDay(instant: Date, timeZone: string): string {
  const d = new TZDate(instant.getTime(), timeZone);
  return `${d.getFullYear()}-${String(d.getMonth() + 1).padStart(2, '0')}-${String(d.getDate()).padStart(2, '0')}`;
}

/** The calendar month in `timeZone` of an instant, YYYY-MM. */
export function localMonth(instant: Date, timeZone: string): string {
  return localDay(instant, timeZone).slice(0, 7);
}

/** The day after a YYYY-MM-DD day. */
export function nextDay(day: string): string {
  const [y, m, d] = day.split('-').map(Number);
  return new Date(Date.UTC(y!, m! - 1, d! + 1)).toISOString().slice(0, 10);
}

/**
 * The window of a workbook for a site. A missing bound is the first day of the site's historian and
 * work-order data (from) or the day after its last (to), as a KPI without bounds reads the whole range of
 * that data (docs/design.md §6, Window); with no data at all both bounds must be given.
 */
export async function resolveReportWindow(db: Db, site: SiteRow, query: Pick<ReportQuery, 'from' | 'to'>): Promise<ReportWindow> {
  let { from: fromDay, to: toDay } = query;
  if (!fromDay || !toDay) {
    const extent = await dataExtent(db, site.id, ['samples', 'work-orders']);
    if (!extent.from || !extent.to) {
      throw badRequest('invalid-window', `Site ${site.code} has no historian or work-order data yet, so there is no window to default to: give from and to (YYYY-MM-DD).`);
    }
    fromDay ??= localDay(extent.from, site.timeZone);
    toDay ??= nextDay(localDay(new Date(extent.to.getTime() - 1), site.timeZone));
  }
  const from = resolveBound(fromDay, site.timeZone);
  const to = resolveBound(toDay, site.timeZone);
  if (from >= to) throw badRequest('invalid-window', `The window is empty: from (${fromDay}) must be a day before to (${toDay}).`);
  return { fromDay, toDay, from, to };
}

/** A site code as a file name may hold it: letters, digits, `_` and `-`; anything else becomes `_`. */
export function fileSafeCode(code: string): string {
  return code.replace(/[^A-Za-z0-9_-]/g, '_').slice(0, 40) || 'site';
}

/** `finance-TFD-2025-01-01-2025-02-01.xlsx`. */
export function reportFileName(name: ReportName, site: string, window: Pick<ReportWindow, 'fromDay' | 'toDay'>): string {
  return `${name}-${fileSafeCode(site)}-${window.fromDay}-${window.toDay}.xlsx`;
}
