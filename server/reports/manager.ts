// The manager workbook: the period's KPIs — availability, MTBF with its bounds and MTTR by asset, downtime
// by cause, time to complete, the membrane alerts of the performance KPI — and a sheet saying what each
// KPI is and where its definition comes from (docs/design.md §6, in our words).
import type { DowntimeReport } from '#shared/schemas/downtime.ts';
import type { PerformanceReport } from '#shared/schemas/performance.ts';
import type { ReliabilityReport } from '#shared/schemas/reliability.ts';
import type { TimeToCompleteReport } from '#shared/schemas/time-to-complete.ts';
import { downtimeKpi, performanceKpi, reliabilityKpi, timeToCompleteKpi } from '../services/kpi-catalog.ts';
import { Formula, sumOf, type Book } from './book.ts';
import { askKpi, freshnessOfAnswers, type ReportContext } from './context.ts';
import { coverOf, writeCover, type CoverContent } from './cover.ts';

export interface ManagerContent {
  cover: CoverContent;
  currency: string;
  reliability: ReliabilityReport;
  downtime: DowntimeReport;
  timeToComplete: TimeToCompleteReport;
  performance: PerformanceReport;
}

export async function loadManager(ctx: ReportContext): Promise<ManagerContent> {
  const [reliability, downtime, timeToComplete, performance] = await Promise.all([
    askKpi(reliabilityKpi, ctx, { groupBy: 'asset' }),
    askKpi(downtimeKpi, ctx),
    askKpi(timeToCompleteKpi, ctx),
    askKpi(performanceKpi, ctx),
  ]);
  const cover = coverOf(ctx, {
    title: 'Manager workbook',
    about: 'The key maintenance figures of the site for the window, and what each of them means.',
    freshness: freshnessOfAnswers([reliability, downtime, timeToComplete, performance]),
    contents: [
      { sheet: 'Reliability', holds: 'Availability, MTBF with its confidence bounds, MTTR and failures, for the site and each asset with failures or a run-status tag.' },
      { sheet: 'Downtime by cause', holds: 'Stop hours, lost permeate and its cost by cause (the failure code of the overlapping corrective work order).' },
      { sheet: 'Time to complete', holds: 'How long jobs took: all, guided or not, by crew and by procedure.' },
      { sheet: 'Membrane alerts', holds: 'Alerts on the latest normalized point of each stage (cleaning triggers), with the cautions.' },
      { sheet: 'Membrane stages', holds: 'The latest normalized permeate flow, salt passage and differential pressure of each stage against its baseline.' },
      { sheet: 'Definitions', holds: 'What each KPI is, its unit and its source.' },
    ],
  });
  return { cover, currency: ctx.settings.currency, reliability, downtime, timeToComplete, performance };
}

async function writeReliability(book: Book, c: ManagerContent): Promise<void> {
  const r = c.reliability;
  const sheet = book.sheet('Reliability', {
    table: true,
    columns: [
      { header: 'Scope', kind: 'text', width: 18 },
      { header: 'Operating time (h)', kind: 'hours', width: 13 },
      { header: 'Failures', kind: 'integer', width: 9 },
      { header: 'MTBF (h)', kind: 'hours', width: 11 },
      { header: `MTBF, lower bound (h)`, kind: 'hours', width: 12 },
      { header: `MTBF, upper bound (h)`, kind: 'hours', width: 12 },
      { header: 'MTTR (h)', kind: 'hours', width: 10 },
      { header: 'Mean active repair (h)', kind: 'hours', width: 12 },
      { header: 'Availability, inherent (%)', kind: 'share', width: 13 },
      { header: 'Availability, operational (%)', kind: 'share', width: 13 },
      { header: 'Operating time from', kind: 'text', width: 26 },
      { header: 'Why blank', kind: 'text', width: 40 },
    ],
  });
  type Figures = Pick<ReliabilityReport, 'operatingHours' | 'failures' | 'mtbfHours' | 'mtbfLowerHours' | 'mtbfUpperHours' | 'mttrHours' | 'availability' | 'operationalAvailability' | 'meanActiveRepairHours' | 'operatingTimeSource' | 'reasons'>;
  const line = (scope: string, f: Figures) =>
    sheet.row([
      scope,
      f.operatingHours,
      f.failures,
      f.mtbfHours,
      f.mtbfLowerHours,
      f.mtbfUpperHours,
      f.mttrHours,
      f.meanActiveRepairHours ?? null,
      f.availability,
      f.operationalAvailability ?? null,
      f.operatingTimeSource ?? null,
      Object.entries(f.reasons ?? {}).map(([k, v]) => `${k}: ${v}`).join('; ') || null,
    ]);
  await line(`Site ${c.cover.site.code}`, r);
  for (const g of r.groups ?? []) await line(g.asset ?? g.key, g);
  sheet.notes('Notes', [
    `Bounds: ${r.sides ?? 'two-sided'} at confidence ${r.confidence}, for a ${r.terminated ?? 'time'}-terminated record (chi-square; NIST/SEMATECH e-Handbook §8.4.5.1).`,
    'A failure is a corrective work order with a failure code, not cancelled, counted at its reported time; an asset’s failures include those of the assets below it.',
    'Inherent availability = MTBF / (MTBF + MTTR); operational availability = up time / (up time + all down time) where the running state is known.',
    ...(r.notes ?? []),
  ]);
  book.done(sheet);
}

async function writeDowntimeByCause(book: Book, c: ManagerContent): Promise<void> {
  const cur = c.currency;
  const d = c.downtime;
  const sheet = book.sheet('Downtime by cause', {
    table: true,
    columns: [
      { header: 'Cause', kind: 'text', width: 18 },
      { header: 'Stops', kind: 'integer', width: 8 },
      { header: 'Stop hours (h)', kind: 'hours', width: 12 },
      { header: 'Planned (h)', kind: 'hours', width: 12 },
      { header: 'Unplanned (h)', kind: 'hours', width: 12 },
      { header: 'Lost volume (m³)', kind: 'm3', width: 14 },
      { header: `Cost (${cur})`, kind: 'money', width: 14 },
      { header: 'Share of stop hours (%)', kind: 'share', width: 12 },
      { header: 'Cumulative share (%)', kind: 'share', width: 12 },
    ],
  });
  for (const p of d.paretoByCause) await sheet.row([p.key, p.events, p.hours, p.plannedHours, p.unplannedHours, p.lostVolumeM3, p.cost, p.share, p.cumulativeShare]);
  const first = 2;
  const last = d.paretoByCause.length + 1;
  const t = d.plant;
  const sum = (col: number, v: number | null) => (v === null ? 'not known' : new Formula(sumOf(col, first, last), v));
  await sheet.row(['Total', sum(2, t.events), sum(3, t.hours), sum(4, t.plannedHours), sum(5, t.unplannedHours), sum(6, t.lostVolumeM3), sum(7, t.cost)], 'total');
  sheet.notes('Notes', [
    'Cause: the failure code of the corrective work order whose out-of-service window overlaps the stop most; "unknown" when none does. Planned: the stop overlaps a preventive or inspection order’s out-of-service window.',
    'Sorted by stop hours (Pareto); each stop is counted once, so the causes add up to the site’s total.',
    ...d.notes,
  ]);
  book.done(sheet);
}

async function writeTimeToComplete(book: Book, c: ManagerContent): Promise<void> {
  const t = c.timeToComplete;
  const sheet = book.sheet('Time to complete', {
    table: true,
    columns: [
      { header: 'Group', kind: 'text', width: 34 },
      { header: 'Jobs', kind: 'integer', width: 7 },
      { header: 'Mean (h)', kind: 'hours', width: 10 },
      { header: 'Median (h)', kind: 'hours', width: 10 },
      { header: '90th percentile (h)', kind: 'hours', width: 12 },
      { header: 'Standard deviation (h)', kind: 'hours', width: 12 },
      { header: 'Shortest (h)', kind: 'hours', width: 10 },
      { header: 'Longest (h)', kind: 'hours', width: 10 },
    ],
  });
  for (const g of t.groups) await sheet.row([g.key, g.n, g.meanHours, g.medianHours, g.p90Hours, g.sdHours ?? null, g.minHours ?? null, g.maxHours ?? null]);
  sheet.notes('Notes', [
    'A job is a work order with steps; it lasts from its first step’s start to its last step’s end, and is guided when any step was done with the written procedure open.',
    `Percentiles: ${t.quantileMethod}.`,
    ...(t.procedureDefinition ? [`Procedure: ${t.procedureDefinition}`] : []),
  ]);
  sheet.notes('Cautions for vessel work', t.cautions ?? []);
  book.done(sheet);
}

async function writeAlerts(book: Book, c: ManagerContent): Promise<void> {
  const p = c.performance;
  const sheet = book.sheet('Membrane alerts', {
    table: true,
    columns: [
      { header: 'Stage', kind: 'text', width: 12 },
      { header: 'Train', kind: 'text', width: 8 },
      { header: 'Alert', kind: 'text', width: 26 },
      { header: 'Latest point (site time)', kind: 'date', width: 13 },
      { header: 'Baseline since (site time)', kind: 'date', width: 13 },
      { header: 'Change from baseline (%)', kind: 'pct', width: 12 },
      { header: 'Threshold (%)', kind: 'pct', width: 10 },
      { header: 'Value', kind: 'decimal', width: 10 },
      { header: 'Baseline value', kind: 'decimal', width: 10 },
      { header: 'Unit', kind: 'text', width: 7 },
      { header: 'What it says', kind: 'text', width: 60 },
      { header: 'Recommendation', kind: 'text', width: 60 },
    ],
  });
  const alerts = p.stages.flatMap((s) => s.alerts.map((a) => ({ stage: s, alert: a })));
  for (const { stage, alert } of alerts) {
    await sheet.row([stage.asset, stage.train ?? null, alert.kind, new Date(alert.time), new Date(alert.since), alert.changePct, alert.thresholdPct, alert.value, alert.baselineValue, alert.unit, alert.message, alert.recommendation]);
  }
  sheet.notes('Notes', [
    alerts.length === 0 ? 'No stage’s latest point crosses an alert threshold.' : `${alerts.length} alert(s) on the latest point of the stages.`,
    'Thresholds are plant settings (common practice cleaning triggers: normalized permeate flow −10 %, differential pressure +15 %, salt passage +5 %). Normalized as ASTM D4516, stage by stage.',
  ]);
  const cautions = [...new Set(alerts.flatMap((a) => a.alert.cautions))];
  sheet.notes('Cautions before cleaning or opening a vessel', cautions);
  book.done(sheet);
}

async function writeStages(book: Book, c: ManagerContent): Promise<void> {
  const sheet = book.sheet('Membrane stages', {
    table: true,
    columns: [
      { header: 'Stage', kind: 'text', width: 12 },
      { header: 'Train', kind: 'text', width: 8 },
      { header: 'Latest point (site time)', kind: 'date', width: 13 },
      { header: 'Normalized permeate flow (m³/h)', kind: 'decimal', width: 14 },
      { header: 'Permeate flow change (%)', kind: 'pct', width: 12 },
      { header: 'Normalized salt passage (%)', kind: 'decimal', width: 12 },
      { header: 'Salt passage change (%)', kind: 'pct', width: 12 },
      { header: 'Normalized ΔP (bar)', kind: 'decimal', width: 12 },
      { header: 'ΔP change (%)', kind: 'pct', width: 10 },
      { header: 'Baseline day (site time)', kind: 'date', width: 13 },
      { header: 'Baseline set by', kind: 'text', width: 22 },
      { header: 'Alerts', kind: 'integer', width: 7 },
      { header: 'Why blank', kind: 'text', width: 50 },
    ],
  });
  for (const s of c.performance.stages) {
    const n = s.latest?.normalized;
    const setBy = s.baseline ? `${s.baseline.setBy.kind}${s.baseline.setBy.workOrder ? ` (${s.baseline.setBy.workOrder})` : ''}` : null;
    await sheet.row([
      s.asset,
      s.train ?? null,
      s.latest ? new Date(s.latest.state.time) : null,
      n?.permeateFlowM3h ?? null,
      n?.permeateFlowChangePct ?? null,
      n?.saltPassagePct ?? null,
      n?.saltPassageChangePct ?? null,
      n?.differentialPressureBar ?? null,
      n?.differentialPressureChangePct ?? null,
      s.baseline ? new Date(s.baseline.time) : null,
      setBy,
      s.alerts.length,
      s.reason ?? n?.nullReason ?? null,
    ]);
  }
  sheet.notes('Notes', [
    'Each stage against its baseline: the first running day of the data, or the first running day after the last cleaning or change-out (docs/design.md §6, Membrane performance).',
    ...(c.performance.notes ?? []),
  ]);
  book.done(sheet);
}

/** What each KPI of the workbooks is, in Osmia's words (docs/design.md §6 has the full rules). */
export const kpiDefinitions: { kpi: string; definition: string; unit: string; source: string; api: string; command: string }[] = [
  {
    kpi: 'Failure',
    definition: 'A corrective work order with a failure code that was not cancelled, placed in time by when it was reported. An asset’s failures are its own and those of every asset below it.',
    unit: 'count',
    source: 'docs/design.md §6 (Failure)',
    api: 'GET /api/kpi/reliability',
    command: 'bin/osmia kpi reliability',
  },
  {
    kpi: 'Operating time',
    definition: 'Hours in the running state over the window, from the asset’s run-status tag or the nearest one above it; without a tag, calendar time less the out-of-service windows of its work orders.',
    unit: 'h',
    source: 'EN 13306 (up time, down time)',
    api: 'GET /api/kpi/reliability',
    command: 'bin/osmia kpi reliability',
  },
  {
    kpi: 'MTBF and its bounds',
    definition: 'Operating time divided by the number of failures. The bounds are two-sided chi-square limits for a record that ends at the window’s end; with no failure only the lower bound exists.',
    unit: 'h',
    source: 'NIST/SEMATECH e-Handbook of Statistical Methods §8.4.5.1',
    api: 'GET /api/kpi/reliability',
    command: 'bin/osmia kpi reliability',
  },
  {
    kpi: 'MTTR',
    definition: 'Mean time to restoration: the out-of-service hours of the failures divided by their number (completed minus reported when an order has no out-of-service window).',
    unit: 'h',
    source: 'IEC 60050-192',
    api: 'GET /api/kpi/reliability',
    command: 'bin/osmia kpi reliability',
  },
  {
    kpi: 'Availability',
    definition: 'Inherent: MTBF / (MTBF + MTTR), counting corrective down time only. Operational: up time / (up time + all down time), planned or not, where the running state is known.',
    unit: '0–100 %',
    source: 'EN 13306; EN 15341 (indicator families)',
    api: 'GET /api/kpi/reliability',
    command: 'bin/osmia kpi reliability',
  },
  {
    kpi: 'Downtime, cause, lost volume and cost',
    definition: 'A stop runs from a running→stopped change of a run-status tag to the next stopped→running change, counted once at the highest stopped asset. Its cause is the failure code of the corrective order overlapping it most; lost volume = hours × rated permeate flow; cost = lost volume × the water value setting.',
    unit: 'h, m³, currency',
    source: 'docs/design.md §6 (Downtime); Pareto analysis, common practice',
    api: 'GET /api/kpi/downtime',
    command: 'bin/osmia kpi downtime',
  },
  {
    kpi: 'Time to complete',
    definition: 'From a job’s first step start to its last step end, in real elapsed hours; guided when any step was done with the written procedure open. Mean, median and 90th percentile per group.',
    unit: 'h',
    source: 'Hyndman & Fan (1996) type 7 sample quantiles',
    api: 'GET /api/kpi/time-to-complete',
    command: 'bin/osmia kpi time-to-complete',
  },
  {
    kpi: 'Membrane alerts',
    definition: 'Each stage’s daily normalized permeate flow, salt passage and differential pressure compared with its baseline; an alert when the latest point passes a threshold setting.',
    unit: '% change',
    source: 'ASTM D4516 (normalization); thresholds common practice',
    api: 'GET /api/kpi/performance',
    command: 'bin/osmia kpi performance',
  },
  {
    kpi: 'Maintenance cost per m³',
    definition: 'Labour plus parts cost of the closed work orders completed in the window, divided by the permeate produced (integrated from the trains’ hourly permeate flows).',
    unit: 'currency per m³',
    source: 'EN 15341 (indicator families); the exact rule is Osmia’s',
    api: 'GET /api/kpi/maintenance-mix',
    command: 'bin/osmia kpi maintenance-mix',
  },
  {
    kpi: 'Replacement forecast',
    definition: 'For each element in service at the window’s end, the probability of a life-ending event in each of the next 12 months given its age, from the Weibull fit of the element lives; expected count = their sum, cost = count × the element cost setting; the band spans the fit’s confidence region.',
    unit: 'elements, currency',
    source: 'Meeker & Escobar, Statistical Methods for Reliability Data, ch. 8',
    api: 'GET /api/kpi/forecast',
    command: 'bin/osmia kpi forecast',
  },
];

async function writeDefinitions(book: Book): Promise<void> {
  const sheet = book.sheet('Definitions', {
    table: true,
    columns: [
      { header: 'KPI', kind: 'text', width: 24 },
      { header: 'What it is', kind: 'text', width: 90 },
      { header: 'Unit', kind: 'text', width: 14 },
      { header: 'Source', kind: 'text', width: 40 },
      { header: 'API', kind: 'text', width: 28 },
      { header: 'Command', kind: 'text', width: 30 },
    ],
  });
  for (const d of kpiDefinitions) await sheet.row([d.kpi, d.definition, d.unit, d.source, d.api, d.command]);
  sheet.notes('Notes', ['The full rules, with their edge cases, are in docs/design.md §6; every API answer also lists what it was computed from (provenance).']);
  book.done(sheet);
}

export async function writeManager(book: Book, c: ManagerContent): Promise<void> {
  await writeCover(book, c.cover);
  await writeReliability(book, c);
  await writeDowntimeByCause(book, c);
  await writeTimeToComplete(book, c);
  await writeAlerts(book, c);
  await writeStages(book, c);
  await writeDefinitions(book);
}
