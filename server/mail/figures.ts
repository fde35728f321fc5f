// The figures of the nightly digest, asked of the KPI catalog exactly as GET /api/kpi/<name> asks them
// (`kpi.ask(raw, settings).answer(db)`), so the mail and the pages can never disagree.
import type { Settings } from '#shared/schemas/settings.ts';
import type { NightlyFigures } from '#shared/schemas/nightly.ts';
import type { Db } from '../db/client.ts';
import type { SiteRow } from '../db/queries/sites.ts';
import { HttpError } from '../errors.ts';
import { downtimeKpi, performanceKpi, reliabilityKpi } from '../services/kpi-catalog.ts';
import { resolveBound } from '../services/scope.ts';

/** The calendar day of an instant in a zone, YYYY-MM-DD. */
export function dayInZone(at: Date, timeZone: string): string {
  return new Intl.DateTimeFormat('en-CA', { timeZone, year: 'numeric', month: '2-digit', day: '2-digit' }).format(at);
}

/** A calendar day `n` days after `day` (YYYY-MM-DD; calendar arithmetic, no zone involved). */
export function addDays(day: string, n: number): string {
  const [y, m, d] = day.split('-').map(Number);
  return new Date(Date.UTC(y, m - 1, d + n)).toISOString().slice(0, 10);
}

/** The digest's two windows for a report day: the day before it, and the seven days before it (half-open, ending at its midnight). */
export function digestWindows(reportDate: string) {
  return [
    { label: 'yesterday' as const, from: addDays(reportDate, -1), to: reportDate },
    { label: 'last-7-days' as const, from: addDays(reportDate, -7), to: reportDate },
  ];
}

export type SiteAlert = NightlyFigures['alerts'][number] & { recommendation: string; cautions: string[] };

export interface SiteReport {
  site: SiteRow;
  figures: NightlyFigures;
  /** The alerts with their recommendation and cautions, for the mail. */
  alerts: SiteAlert[];
  /** Stages whose latest point the performance answer had: only there can an alert be seen to have cleared. */
  stagesWithLatest: Set<string>;
  /** False when the performance answer failed: then no alert is opened or cleared. */
  performanceAnswered: boolean;
}

const messageOf = (err: unknown) => (err instanceof HttpError || err instanceof Error ? err.message : String(err));

/** Reliability and downtime of the site for both windows, and the membrane alerts of the last seven days. */
export async function siteReport(db: Db, site: SiteRow, reportDate: string, settings: Settings): Promise<SiteReport> {
  const windows: NightlyFigures['windows'] = [];
  for (const w of digestWindows(reportDate)) {
    const raw = { site: site.code, from: w.from, to: w.to };
    const notes: string[] = [];
    let reliability: NightlyFigures['windows'][number]['reliability'] = null;
    let downtime: NightlyFigures['windows'][number]['downtime'] = null;
    try {
      const r = await reliabilityKpi.ask(raw, settings).answer(db);
      reliability = {
        availability: r.availability,
        operationalAvailability: r.operationalAvailability ?? null,
        mtbfHours: r.mtbfHours,
        mttrHours: r.mttrHours,
        failures: r.failures,
      };
      notes.push(...r.warnings);
    } catch (err) {
      notes.push(`Reliability: ${messageOf(err)}`);
    }
    try {
      const d = await downtimeKpi.ask(raw, settings).answer(db);
      downtime = { ...d.plant, currency: d.currency ?? null };
      for (const warning of d.warnings) if (!notes.includes(warning)) notes.push(warning);
    } catch (err) {
      notes.push(`Downtime: ${messageOf(err)}`);
    }
    windows.push({
      label: w.label,
      from: resolveBound(w.from, site.timeZone).toISOString(),
      to: resolveBound(w.to, site.timeZone).toISOString(),
      reliability,
      downtime,
      notes,
    });
  }
  const alerts: SiteAlert[] = [];
  const stagesWithLatest = new Set<string>();
  let performanceAnswered = false;
  const week = digestWindows(reportDate)[1];
  try {
    const p = await performanceKpi.ask({ site: site.code, from: week.from, to: week.to }, settings).answer(db);
    performanceAnswered = true;
    for (const stage of p.stages) {
      if (stage.latest) stagesWithLatest.add(stage.asset);
      for (const a of stage.alerts) {
        alerts.push({ stage: stage.asset, kind: a.kind, changePct: a.changePct, thresholdPct: a.thresholdPct, since: a.since, message: a.message, recommendation: a.recommendation, cautions: a.cautions });
      }
    }
  } catch (err) {
    windows[1].notes.push(`Membrane performance: ${messageOf(err)}`);
  }
  return {
    site,
    figures: { site: site.code, timeZone: site.timeZone, windows, alerts: alerts.map(({ recommendation: _r, cautions: _c, ...a }) => a) },
    alerts,
    stagesWithLatest,
    performanceAnswered,
  };
}
