// What every workbook is built from: the site, the window, the plant's settings, and the KPI catalog's
// answers for that site and window — the same objects GET /api/kpi/<name> serves, so a figure in a
// workbook is the API's figure, never a second computation of it.
import type { Freshness } from '#shared/schemas/common.ts';
import type { Settings } from '#shared/schemas/settings.ts';
import type { Db } from '../db/client.ts';
import type { SiteRow } from '../db/queries/sites.ts';
import type { Kpi } from '../services/kpi-catalog.ts';
import type { ReportWindow } from './window.ts';

export interface ReportContext {
  db: Db;
  site: SiteRow;
  window: ReportWindow;
  settings: Settings;
  generatedAt: Date;
}

/** A KPI's answer for the workbook's site and window (plus the KPI's own options), as the API answers it. */
export function askKpi<Answer>(kpi: Kpi<Answer>, ctx: ReportContext, options: Record<string, unknown> = {}): Promise<Answer> {
  return kpi.ask({ site: ctx.site.code, from: ctx.window.fromDay, to: ctx.window.toDay, ...options }, ctx.settings).answer(ctx.db);
}

/** The cover's "newest data": the newest of the answers' dataAsOf, whether all were up to date, and every warning once. */
export function freshnessOfAnswers(answers: readonly Freshness[]): Freshness {
  const newest = (pick: (f: Freshness) => string | null) =>
    answers.map(pick).reduce<string | null>((a, b) => (b !== null && (a === null || Date.parse(b) > Date.parse(a)) ? b : a), null);
  return {
    dataAsOf: { newestSampleAt: newest((f) => f.dataAsOf.newestSampleAt), newestWorkOrderAt: newest((f) => f.dataAsOf.newestWorkOrderAt) },
    derivedUpToDate: answers.every((f) => f.derivedUpToDate),
    warnings: [...new Set(answers.flatMap((f) => f.warnings))],
  };
}
