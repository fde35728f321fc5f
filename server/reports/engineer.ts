// The engineer workbook: the element register with each element's age and its conditional risk (the
// forecast answer's probability of a life-ending event over its horizon, given the element's age), the
// failure list (corrective work orders with a failure code), and the import history with its rejects.
import { isFailure, type WorkOrderRecord } from '#shared/kpi/work-orders.ts';
import { lifeEndingReasons, type AssetKind } from '#shared/schemas/enums.ts';
import type { ForecastReport } from '#shared/schemas/forecast.ts';
import { listAssets } from '../db/queries/assets.ts';
import { listElementInstalls } from '../db/queries/elements.ts';
import { listSiteImports, listSiteRejects, type ImportLine, type RejectLine } from '../db/queries/reports.ts';
import { listWorkOrdersReportedIn } from '../db/queries/work-orders.ts';
import { workOrderRecords } from '../services/work-orders.ts';
import { forecastKpi, reliabilityKpi } from '../services/kpi-catalog.ts';
import { Formula, formatsAt, sumOf, type Book } from './book.ts';
import { askKpi, freshnessOfAnswers, type ReportContext } from './context.ts';
import { coverOf, writeCover, type CoverContent } from './cover.ts';
import { placesOf } from './places.ts';

export interface RegisterRow {
  serial: string;
  model: string;
  train: string | null;
  stage: string | null;
  vessel: string;
  position: number;
  installedAt: Date;
  removedAt: Date | null;
  reason: string | null;
  lifeEnding: boolean;
  /** In service at the window's end (installed before it, not removed before it). */
  inService: boolean;
  /** Age at the window's end, or at removal when removed before it, days. */
  ageDays: number;
  /** The forecast's probability of a life-ending event over its horizon, given survival to the window's end; null when not forecast. */
  risk: number | null;
}

/** A failure as the list shows it: the shared work-order record, its asset's kind, its failure code trimmed. */
export type FailureLine = WorkOrderRecord & { assetKind: AssetKind; failureCode: string };

/** The site's failures reported in the window, by the one rule MTBF counts by (`isFailure`), by reported time. */
async function failuresOf(ctx: ReportContext): Promise<FailureLine[]> {
  const [assets, orders] = await Promise.all([
    listAssets(ctx.db.$client, ctx.site.id),
    listWorkOrdersReportedIn(ctx.db.$client, ctx.site.id, ctx.window.from, ctx.window.to),
  ]);
  const kindOf = new Map(assets.map((a) => [a.code, a.kind]));
  return workOrderRecords(orders, assets)
    .filter(isFailure)
    .map((wo) => ({ ...wo, assetKind: kindOf.get(wo.asset)!, failureCode: wo.failureCode!.trim() }));
}

export interface EngineerContent {
  cover: CoverContent;
  currency: string;
  register: RegisterRow[];
  /** How the risk column was obtained (horizon, fit, elements not listed). */
  riskNotes: string[];
  cautions: readonly string[];
  failures: FailureLine[];
  imports: ImportLine[];
  rejects: RejectLine[];
  /** Rejected rows of the site's imports in all (the sheet lists at most `rejectSheetLimit`). */
  rejectsTotal: number;
}

/** Rejected rows listed at most; the rest are in each import's rejects.csv. */
export const rejectSheetLimit = 100_000;

const DAY_MS = 86_400_000;

function riskNotesOf(f: ForecastReport, listed: number, inService: number): string[] {
  const all = f.groups.find((g) => g.key === 'all');
  const horizonEnd = f.totals.at(-1)?.to;
  const notes = [
    `Risk: the forecast’s probability that the element has a life-ending event (failed, performance, damaged) between the window’s end and ${horizonEnd ?? 'the horizon’s end'}, given that it survived to its age at the window’s end (docs/design.md §6, Replacement forecast).`,
  ];
  if (all?.weibull) notes.push(`Weibull fit of the site's element lives over the window: shape β = ${all.weibull.shape.toFixed(3)}, scale η = ${all.weibull.scaleDays.toFixed(1)} days.`);
  if (listed < inService) notes.push(`The forecast lists ${listed} of the ${inService} elements in service (the most likely first, or none without a fit); the others have no risk here.`);
  return [...notes, ...(f.notes ?? [])];
}

async function registerOf(ctx: ReportContext, forecast: ForecastReport): Promise<{ rows: RegisterRow[]; listed: number; inService: number }> {
  const [installs, assets] = await Promise.all([listElementInstalls(ctx.db.$client, ctx.site.id, null, ctx.window.to), listAssets(ctx.db.$client, ctx.site.id)]);
  const places = placesOf(assets);
  const risk = new Map((forecast.groups.find((g) => g.key === 'all')?.elements ?? []).map((e) => [e.serial, e.probability]));
  const ending = new Set<string>(lifeEndingReasons);
  const { from, to } = ctx.window;
  const rows: RegisterRow[] = [];
  for (const e of installs) {
    // The lives the window sees: installed before its end, not removed before its start.
    if (e.removedAt !== null && e.removedAt < from) continue;
    const inService = e.removedAt === null || e.removedAt >= to;
    const end = inService ? to : e.removedAt!;
    const place = places.get(e.vesselId);
    rows.push({
      serial: e.serial,
      model: e.model,
      train: place?.train ?? null,
      stage: place?.stage ?? null,
      vessel: place?.vessel ?? String(e.vesselId),
      position: e.position,
      installedAt: e.installedAt,
      removedAt: e.removedAt,
      reason: e.removalReason,
      lifeEnding: e.removalReason !== null && ending.has(e.removalReason),
      inService,
      ageDays: (end.getTime() - e.installedAt.getTime()) / DAY_MS,
      risk: inService ? (risk.get(e.serial) ?? null) : null,
    });
  }
  const order = (a: RegisterRow, b: RegisterRow) =>
    (a.vessel < b.vessel ? -1 : a.vessel > b.vessel ? 1 : a.position - b.position) || a.installedAt.getTime() - b.installedAt.getTime();
  const inService = rows.filter((r) => r.inService).length;
  return { rows: rows.sort(order), listed: rows.filter((r) => r.risk !== null).length, inService };
}

export async function loadEngineer(ctx: ReportContext): Promise<EngineerContent> {
  const [forecast, reliability] = await Promise.all([askKpi(forecastKpi, ctx), askKpi(reliabilityKpi, ctx)]);
  const [register, failures, imports, rejects] = await Promise.all([
    registerOf(ctx, forecast),
    failuresOf(ctx),
    listSiteImports(ctx.db.$client, ctx.site.id),
    listSiteRejects(ctx.db.$client, ctx.site.id, rejectSheetLimit),
  ]);
  const cover = coverOf(ctx, {
    title: 'Engineer workbook',
    about: 'The element register with ages and risk, the failures of the window, and the import history of the site with its rejected rows.',
    freshness: freshnessOfAnswers([forecast, reliability]),
    contents: [
      { sheet: 'Element register', holds: 'Every element install the window sees, its place, age and — for those in service at the window’s end — the forecast’s risk of a life-ending event in the next 12 months.' },
      { sheet: 'Failures', holds: 'Corrective work orders with a failure code reported in the window, not cancelled (what MTBF counts).' },
      { sheet: 'Imports', holds: 'Every import of the site, newest first, with its row counts.' },
      { sheet: 'Import rejects', holds: 'The rejected rows of those imports with their line, reason and the text as read.' },
    ],
  });
  return {
    cover,
    currency: ctx.settings.currency,
    register: register.rows,
    riskNotes: riskNotesOf(forecast, register.listed, register.inService),
    cautions: forecast.cautions ?? [],
    failures,
    imports,
    rejects: rejects.rows,
    rejectsTotal: rejects.total,
  };
}

export async function writeRegister(book: Book, rows: readonly RegisterRow[], notes: readonly string[], cautions: readonly string[]): Promise<void> {
  const sheet = book.sheet('Element register', {
    table: true,
    columns: [
      { header: 'Serial', kind: 'text', width: 16 },
      { header: 'Model', kind: 'text', width: 14 },
      { header: 'Train', kind: 'text', width: 8 },
      { header: 'Stage', kind: 'text', width: 10 },
      { header: 'Vessel', kind: 'text', width: 14 },
      { header: 'Position', kind: 'integer', width: 9 },
      { header: 'Installed (site time)', kind: 'datetime', width: 17 },
      { header: 'Removed (site time)', kind: 'datetime', width: 17 },
      { header: 'Removal reason', kind: 'text', width: 13 },
      { header: 'Life-ending', kind: 'flag', width: 10 },
      { header: 'In service at window end', kind: 'flag', width: 11 },
      { header: 'Age (days)', kind: 'days', width: 10 },
      { header: 'Risk, next 12 months (%)', kind: 'probability', width: 12 },
    ],
  });
  for (const r of rows) {
    await sheet.row([r.serial, r.model, r.train, r.stage, r.vessel, r.position, r.installedAt, r.removedAt, r.reason, r.lifeEnding, r.inService, r.ageDays, r.risk]);
  }
  sheet.notes('Notes', ['Age: at the window’s end for an element in service then, else at its removal.', ...notes]);
  sheet.notes('Cautions for replacing elements', cautions);
  book.done(sheet);
}

async function writeFailures(book: Book, c: EngineerContent): Promise<void> {
  const cur = c.currency;
  const sheet = book.sheet('Failures', {
    table: true,
    columns: [
      { header: 'Work order', kind: 'text', width: 14 },
      { header: 'Asset', kind: 'text', width: 14 },
      { header: 'Asset kind', kind: 'text', width: 10 },
      { header: 'Failure code', kind: 'text', width: 14 },
      { header: 'Priority', kind: 'text', width: 10 },
      { header: 'Status', kind: 'text', width: 11 },
      { header: 'Reported (site time)', kind: 'datetime', width: 17 },
      { header: 'Started (site time)', kind: 'datetime', width: 17 },
      { header: 'Completed (site time)', kind: 'datetime', width: 17 },
      { header: 'Out of service from (site time)', kind: 'datetime', width: 17 },
      { header: 'Out of service to (site time)', kind: 'datetime', width: 17 },
      { header: 'Out of service (h)', kind: 'hours', width: 11 },
      { header: 'Labour (h)', kind: 'hours', width: 10 },
      { header: `Labour cost (${cur})`, kind: 'money', width: 13 },
      { header: `Parts cost (${cur})`, kind: 'money', width: 13 },
      { header: 'Crew', kind: 'text', width: 12 },
      { header: 'Description', kind: 'text', width: 60 },
    ],
  });
  for (const f of c.failures) {
    const oos = f.outOfServiceFrom && f.outOfServiceTo ? (f.outOfServiceTo.getTime() - f.outOfServiceFrom.getTime()) / 3_600_000 : null;
    await sheet.row([
      f.woNumber,
      f.asset,
      f.assetKind,
      f.failureCode,
      f.priority,
      f.status,
      f.reportedAt,
      f.startedAt,
      f.completedAt,
      f.outOfServiceFrom,
      f.outOfServiceTo,
      oos,
      f.labourHours,
      f.labourCost,
      f.partsCost,
      f.crew,
      f.description,
    ]);
  }
  const first = 2;
  const last = c.failures.length + 1;
  await sheet.row(
    [
      'Total',
      new Formula(last < first ? '0' : `COUNTA(A${first}:A${last})`, c.failures.length),
      null,
      null,
      null,
      null,
      null,
      null,
      null,
      null,
      null,
      new Formula(sumOf(12, first, last), c.failures.reduce((s, f) => s + (f.outOfServiceFrom && f.outOfServiceTo ? (f.outOfServiceTo.getTime() - f.outOfServiceFrom.getTime()) / 3_600_000 : 0), 0)),
      new Formula(sumOf(13, first, last), c.failures.reduce((s, f) => s + f.labourHours, 0)),
      new Formula(sumOf(14, first, last), c.failures.reduce((s, f) => s + f.labourCost, 0)),
      new Formula(sumOf(15, first, last), c.failures.reduce((s, f) => s + f.partsCost, 0)),
    ],
    'total',
    formatsAt({ 1: 'integer' }),
  );
  sheet.notes('Notes', [
    'A failure: a corrective work order with a failure code, not cancelled, reported in the window (docs/design.md §6) — the r of MTBF = T / r. The count is the reliability answer’s failures for the site.',
  ]);
  book.done(sheet);
}

async function writeImports(book: Book, c: EngineerContent): Promise<void> {
  const sheet = book.sheet('Imports', {
    table: true,
    columns: [
      { header: 'Import', kind: 'integer', width: 8 },
      { header: 'Kind', kind: 'text', width: 12 },
      { header: 'File', kind: 'text', width: 36 },
      { header: 'Started (site time)', kind: 'datetime', width: 17 },
      { header: 'By', kind: 'text', width: 24 },
      { header: 'Status', kind: 'text', width: 10 },
      { header: 'Rows read', kind: 'integer', width: 11 },
      { header: 'Inserted', kind: 'integer', width: 11 },
      { header: 'Updated', kind: 'integer', width: 9 },
      { header: 'Unchanged', kind: 'integer', width: 10 },
      { header: 'Rejected', kind: 'integer', width: 9 },
      { header: 'Duration (s)', kind: 'decimal', width: 10 },
      { header: 'Error', kind: 'text', width: 50 },
    ],
  });
  for (const i of c.imports) {
    await sheet.row([i.id, i.kind, i.file, i.startedAt, i.actor, i.status, i.rowsRead, i.rowsInserted, i.rowsUpdated, i.rowsUnchanged, i.rowsRejected, i.durationMs / 1000, i.error]);
  }
  sheet.notes('Notes', ['Every import of the site, whatever the window: the history of its data. GET /api/imports/:id has each record, /rejects.csv all its rejected rows.']);
  book.done(sheet);
}

async function writeRejects(book: Book, c: EngineerContent): Promise<void> {
  const sheet = book.sheet('Import rejects', {
    table: true,
    columns: [
      { header: 'Import', kind: 'integer', width: 8 },
      { header: 'File', kind: 'text', width: 36 },
      { header: 'Line', kind: 'integer', width: 8 },
      { header: 'Reason', kind: 'text', width: 60 },
      { header: 'Row as read', kind: 'text', width: 90 },
    ],
  });
  for (const r of c.rejects) await sheet.row([r.importId, r.file, r.line, r.reason, r.raw]);
  const more = c.rejectsTotal - c.rejects.length;
  sheet.notes('Notes', [
    ...(c.rejects.length === 0 ? ['No import of the site rejected a row.'] : []),
    'Line numbers are physical lines of the file, the header being line 1. "Row as read" is the text of the line, kept as text.',
    ...(more > 0 ? [`${more} more rejected rows are not listed here: download each import’s rejects.csv (GET /api/imports/:id/rejects.csv).`] : []),
  ]);
  book.done(sheet);
}

export async function writeEngineer(book: Book, c: EngineerContent): Promise<void> {
  await writeCover(book, c.cover);
  await writeRegister(book, c.register, c.riskNotes, c.cautions);
  await writeFailures(book, c);
  await writeImports(book, c);
  await writeRejects(book, c);
}
