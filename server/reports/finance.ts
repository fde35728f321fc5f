// The finance workbook: maintenance cost by month × asset × work-order type (labour, parts) with the cost
// per m³ produced, downtime cost by asset, the element replacements done in the window and their cost,
// and the 12-month replacement budget with its band. Totals are SUM formulas over the rows above, with
// the API's figure as their cached result (maintenance-mix, downtime, element-life, forecast answers).
import type { DowntimeReport } from '#shared/schemas/downtime.ts';
import { lifeEndingReasons } from '#shared/schemas/enums.ts';
import type { ForecastReport } from '#shared/schemas/forecast.ts';
import type { MaintenanceMixReport } from '#shared/schemas/maintenance-mix.ts';
import { listAssets } from '../db/queries/assets.ts';
import { listElementInstalls } from '../db/queries/elements.ts';
import { listCostLines } from '../db/queries/reports.ts';
import { downtimeKpi, elementLifeKpi, forecastKpi, maintenanceMixKpi } from '../services/kpi-catalog.ts';
import { Formula, formatsAt, sheetRef, sumOf, type Book, type CellInput, type ColumnSpec } from './book.ts';
import { askKpi, freshnessOfAnswers, type ReportContext } from './context.ts';
import { coverOf, writeCover, type CoverContent } from './cover.ts';
import { placesOf } from './places.ts';
import { localMonth } from './window.ts';

export interface CostRow {
  /** YYYY-MM of the completion, in the site's zone. */
  month: string;
  asset: string;
  assetName: string;
  type: string;
  workOrders: number;
  labourHours: number;
  labourCost: number;
  partsCost: number;
}

export interface ReplacementRow {
  removedAt: Date;
  train: string | null;
  stage: string | null;
  vessel: string;
  position: number;
  serial: string;
  model: string;
  installedAt: Date;
  ageDays: number;
  reason: string | null;
  lifeEnding: boolean;
  /** The element installed in the same position after it, when that was before the window's end. */
  replacedBy: string | null;
  replacedAt: Date | null;
}

export interface FinanceContent {
  cover: CoverContent;
  currency: string;
  elementUnitCost: number;
  costRows: CostRow[];
  mix: MaintenanceMixReport;
  downtime: DowntimeReport;
  replacements: ReplacementRow[];
  /** Life-ending events in the window as element life counts them (its `all` group). */
  lifeEndingEvents: number;
  forecast: ForecastReport;
}

const DAY_MS = 86_400_000;

/** The cost lines the maintenance-mix answer counted, summed by month, asset and type (rows for finance to filter). */
async function costRowsOf(ctx: ReportContext, mix: MaintenanceMixReport): Promise<CostRow[]> {
  const lines = await listCostLines(ctx.db.$client, ctx.site.id, mix.labour.workOrders);
  const rows = new Map<string, CostRow>();
  for (const l of lines) {
    const month = localMonth(l.completedAt, ctx.site.timeZone);
    const key = `${month}\u0000${l.assetCode}\u0000${l.type}`;
    let row = rows.get(key);
    if (!row) rows.set(key, (row = { month, asset: l.assetCode, assetName: l.assetName, type: l.type, workOrders: 0, labourHours: 0, labourCost: 0, partsCost: 0 }));
    row.workOrders += 1;
    row.labourHours += l.labourHours;
    row.labourCost += l.labourCost;
    row.partsCost += l.partsCost;
  }
  const order = (a: CostRow, b: CostRow) => (a.month < b.month ? -1 : a.month > b.month ? 1 : a.asset < b.asset ? -1 : a.asset > b.asset ? 1 : a.type < b.type ? -1 : a.type > b.type ? 1 : 0);
  return [...rows.values()].sort(order);
}

/** Element removals in the window, each with the element that took its place (when it did before the window's end). */
async function replacementsOf(ctx: ReportContext): Promise<ReplacementRow[]> {
  const [installs, assets] = await Promise.all([listElementInstalls(ctx.db.$client, ctx.site.id, null, ctx.window.to), listAssets(ctx.db.$client, ctx.site.id)]);
  const places = placesOf(assets);
  const byPosition = new Map<string, typeof installs>();
  for (const e of installs) {
    const key = `${e.vesselId}:${e.position}`;
    (byPosition.get(key) ?? byPosition.set(key, []).get(key)!).push(e);
  }
  const ending = new Set<string>(lifeEndingReasons);
  const out: ReplacementRow[] = [];
  for (const e of installs) {
    if (!e.removedAt || e.removedAt < ctx.window.from || e.removedAt >= ctx.window.to) continue;
    const next = (byPosition.get(`${e.vesselId}:${e.position}`) ?? [])
      .filter((n) => n !== e && n.installedAt >= e.removedAt! && n.installedAt < ctx.window.to)
      .sort((a, b) => a.installedAt.getTime() - b.installedAt.getTime())[0];
    const place = places.get(e.vesselId);
    out.push({
      removedAt: e.removedAt,
      train: place?.train ?? null,
      stage: place?.stage ?? null,
      vessel: place?.vessel ?? String(e.vesselId),
      position: e.position,
      serial: e.serial,
      model: e.model,
      installedAt: e.installedAt,
      ageDays: (e.removedAt.getTime() - e.installedAt.getTime()) / DAY_MS,
      reason: e.removalReason,
      lifeEnding: e.removalReason !== null && ending.has(e.removalReason),
      replacedBy: next?.serial ?? null,
      replacedAt: next?.installedAt ?? null,
    });
  }
  return out.sort((a, b) => a.removedAt.getTime() - b.removedAt.getTime() || (a.serial < b.serial ? -1 : 1));
}

export async function loadFinance(ctx: ReportContext): Promise<FinanceContent> {
  const [mix, downtime, forecast, life] = await Promise.all([
    askKpi(maintenanceMixKpi, ctx),
    askKpi(downtimeKpi, ctx),
    askKpi(forecastKpi, ctx),
    askKpi(elementLifeKpi, ctx),
  ]);
  const [costRows, replacements] = await Promise.all([costRowsOf(ctx, mix), replacementsOf(ctx)]);
  const cover = coverOf(ctx, {
    title: 'Finance workbook',
    about: 'Maintenance cost, downtime cost, element replacements and the replacement budget of the site for the window.',
    freshness: freshnessOfAnswers([mix, downtime, forecast, life]),
    contents: [
      { sheet: 'Summary', holds: 'The totals of the sheets below, as formulas that point at them.' },
      { sheet: 'Maintenance cost', holds: 'Labour and parts cost of the closed work orders completed in the window, by month, asset and work-order type; cost per m³ of permeate produced.' },
      { sheet: 'Downtime cost', holds: 'Stops by asset: hours, lost permeate volume and its value (water value setting).' },
      { sheet: 'Element replacements', holds: 'Elements removed in the window, what replaced them, and the cost of the replacements (element cost setting).' },
      { sheet: 'Replacement budget', holds: 'Expected element replacements and their cost for the 12 months after the window, with the band of the fit.' },
    ],
  });
  return {
    cover,
    currency: ctx.settings.currency,
    elementUnitCost: ctx.settings.elementUnitCost,
    costRows,
    mix,
    downtime,
    replacements,
    lifeEndingEvents: life.groups.find((g) => g.key === 'all')?.events ?? 0,
    forecast,
  };
}

// Sheet names, referred to by the summary's formulas.
const COST = 'Maintenance cost';
const DOWNTIME = 'Downtime cost';
const REPLACEMENTS = 'Element replacements';
const BUDGET = 'Replacement budget';

/** Where the totals of each sheet land: the summary's formulas point at these cells. */
interface Layout {
  costTotal: number;
  produced: number;
  perM3: number;
  downtimeTotal: number;
  replacementTotal: number;
  budgetTotal: number;
}

function layoutOf(c: FinanceContent): Layout {
  // Header on row 1, data from row 2, the total right under the data.
  const costTotal = c.costRows.length + 2;
  return {
    costTotal,
    produced: costTotal + 2,
    perM3: costTotal + 3,
    downtimeTotal: c.downtime.totals.length + 2,
    replacementTotal: c.replacements.length + 2,
    budgetTotal: budgetMonths(c.forecast).length + 2,
  };
}

/** The forecast's months: the `all` group's (with its band) when it has a fit, else the totals (no band). */
function budgetMonths(f: ForecastReport) {
  const all = f.groups.find((g) => g.key === 'all');
  return all ? all.months : f.totals.map((t) => ({ ...t, partial: undefined, countLower: null, countUpper: null, costLower: null, costUpper: null }));
}

async function writeSummary(book: Book, c: FinanceContent, at: Layout): Promise<void> {
  const cur = c.currency;
  const sheet = book.sheet('Summary', {
    table: true,
    columns: [
      { header: 'Figure', kind: 'text', width: 52 },
      { header: 'Value', kind: 'money', width: 18 },
      { header: 'Unit', kind: 'text', width: 12 },
      { header: 'Sheet', kind: 'text', width: 24 },
    ],
  });
  const mix = c.mix.cost;
  const dt = c.downtime.plant;
  const all = c.forecast.groups.find((g) => g.key === 'all');
  const ref = (s: string, col: number, row: number, result: number | null) => new Formula(sheetRef(s, col, row), result);
  const rows: [string, CellInput, string, string, ('integer' | 'decimal' | 'rate' | 'm3' | 'hours')?][] = [
    ['Maintenance labour cost', ref(COST, 7, at.costTotal, mix.labourCost), cur, COST],
    ['Maintenance parts cost', ref(COST, 8, at.costTotal, mix.partsCost), cur, COST],
    ['Maintenance cost, labour + parts', ref(COST, 9, at.costTotal, mix.totalCost), cur, COST],
    ['Permeate produced', mix.producedM3 === null ? 'not known' : ref(COST, 9, at.produced, mix.producedM3), 'm³', COST, 'm3'],
    ['Maintenance cost per m³ produced', mix.costPerM3 === null ? 'not known' : ref(COST, 9, at.perM3, mix.costPerM3), `${cur}/m³`, COST, 'rate'],
    ['Stops', ref(DOWNTIME, 2, at.downtimeTotal, dt.events), 'stops', DOWNTIME, 'integer'],
    ['Stop hours', ref(DOWNTIME, 3, at.downtimeTotal, dt.hours), 'h', DOWNTIME, 'hours'],
    ['Lost permeate volume', dt.lostVolumeM3 === null ? 'not known' : ref(DOWNTIME, 6, at.downtimeTotal, dt.lostVolumeM3), 'm³', DOWNTIME, 'm3'],
    ['Downtime cost (lost permeate at the water value)', dt.cost === null ? 'not known' : ref(DOWNTIME, 7, at.downtimeTotal, dt.cost), cur, DOWNTIME],
    ['Elements removed', ref(REPLACEMENTS, 6, at.replacementTotal, c.replacements.length), 'elements', REPLACEMENTS, 'integer'],
    ['Elements replaced', ref(REPLACEMENTS, 12, at.replacementTotal, c.replacements.filter((r) => r.replacedBy).length), 'elements', REPLACEMENTS, 'integer'],
    ['Cost of the replacements', ref(REPLACEMENTS, 14, at.replacementTotal, c.replacements.filter((r) => r.replacedBy).length * c.elementUnitCost), cur, REPLACEMENTS],
    ['Expected replacements, next 12 months', ref(BUDGET, 5, at.budgetTotal, (all?.total ?? sumTotals(c.forecast)).expectedCount), 'elements', BUDGET, 'decimal'],
    ['Replacement budget, next 12 months', ref(BUDGET, 8, at.budgetTotal, (all?.total ?? sumTotals(c.forecast)).expectedCost), cur, BUDGET],
    ['Replacement budget, low end of the band', all?.total.costLower ?? 'none', cur, BUDGET],
    ['Replacement budget, high end of the band', all?.total.costUpper ?? 'none', cur, BUDGET],
  ];
  for (const [figure, value, unit, from, kind] of rows) await sheet.row([figure, value, unit, from], 'data', kind ? formatsAt({ 1: kind }) : undefined);
  sheet.notes('Notes', [
    'Each value is a formula pointing at the total on its sheet; the band of the budget is not a sum of the monthly bands, so it is a value (the forecast answer’s).',
    `Costs in ${cur}; the element cost setting is ${c.elementUnitCost} ${cur} per element.`,
  ]);
  book.done(sheet);
}

function sumTotals(f: ForecastReport) {
  return { expectedCount: f.totals.reduce((s, t) => s + t.expectedCount, 0), expectedCost: f.totals.reduce((s, t) => s + t.expectedCost, 0) };
}

async function writeCost(book: Book, c: FinanceContent, at: Layout): Promise<void> {
  const cur = c.currency;
  const columns: ColumnSpec[] = [
    { header: 'Month (completed)', kind: 'text', width: 12 },
    { header: 'Asset', kind: 'text', width: 14 },
    { header: 'Asset name', kind: 'text', width: 28 },
    { header: 'Work-order type', kind: 'text', width: 14 },
    { header: 'Work orders', kind: 'integer', width: 10 },
    { header: 'Labour (h)', kind: 'hours', width: 11 },
    { header: `Labour cost (${cur})`, kind: 'money', width: 15 },
    { header: `Parts cost (${cur})`, kind: 'money', width: 15 },
    { header: `Total cost (${cur})`, kind: 'money', width: 15 },
  ];
  const sheet = book.sheet(COST, { table: true, columns });
  for (const r of c.costRows) {
    const n = sheet.nextRow;
    await sheet.row([r.month, r.asset, r.assetName, r.type, r.workOrders, r.labourHours, r.labourCost, r.partsCost, new Formula(`G${n}+H${n}`, r.labourCost + r.partsCost)]);
  }
  const first = 2;
  const last = at.costTotal - 1;
  const mix = c.mix;
  await sheet.row(
    [
      'Total',
      null,
      null,
      null,
      new Formula(sumOf(5, first, last), mix.labour.workOrders.length),
      new Formula(sumOf(6, first, last), mix.labour.totalHours),
      new Formula(sumOf(7, first, last), mix.cost.labourCost),
      new Formula(sumOf(8, first, last), mix.cost.partsCost),
      new Formula(sumOf(9, first, last), mix.cost.totalCost),
    ],
    'total',
  );
  sheet.blank();
  const produced = mix.cost.producedM3;
  await sheet.row(['Permeate produced in the window (m³)', null, null, null, null, null, null, null, produced ?? 'not known'], 'aside', formatsAt({ 8: 'm3' }));
  await sheet.row(
    [`Maintenance cost per m³ produced (${cur}/m³)`, null, null, null, null, null, null, null, mix.cost.costPerM3 === null ? 'not known' : new Formula(`I${at.costTotal}/I${at.produced}`, mix.cost.costPerM3)],
    'aside',
    formatsAt({ 8: 'rate' }),
  );
  sheet.notes('Notes', [
    'Counted: closed work orders completed in the window, on every asset of the site (docs/design.md §6, Maintenance mix). Months are calendar months of the completion time in the site’s zone.',
    ...(mix.cost.reason ? [`Cost per m³: ${mix.cost.reason}`] : []),
    ...mix.notes,
  ]);
  book.done(sheet);
}

async function writeDowntime(book: Book, c: FinanceContent, at: Layout): Promise<void> {
  const cur = c.currency;
  const sheet = book.sheet(DOWNTIME, {
    table: true,
    columns: [
      { header: 'Asset', kind: 'text', width: 14 },
      { header: 'Stops', kind: 'integer', width: 8 },
      { header: 'Stop hours (h)', kind: 'hours', width: 12 },
      { header: 'Planned (h)', kind: 'hours', width: 12 },
      { header: 'Unplanned (h)', kind: 'hours', width: 12 },
      { header: 'Lost volume (m³)', kind: 'm3', width: 14 },
      { header: `Cost (${cur})`, kind: 'money', width: 14 },
      { header: 'Rated permeate (m³/h)', kind: 'm3', width: 14 },
      { header: 'Rated flow of', kind: 'text', width: 14 },
      { header: 'Run-status tag', kind: 'text', width: 18 },
    ],
  });
  const d = c.downtime;
  for (const t of d.totals) {
    await sheet.row([t.asset, t.events, t.hours, t.plannedHours, t.unplannedHours, t.lostVolumeM3, t.cost, t.ratedPermeateM3h, t.ratedPermeateFrom, t.tag]);
  }
  const first = 2;
  const last = at.downtimeTotal - 1;
  const p = d.plant;
  const sum = (col: number, value: number | null) => (value === null ? 'not known' : new Formula(sumOf(col, first, last), value));
  await sheet.row(['Total', sum(2, p.events), sum(3, p.hours), sum(4, p.plannedHours), sum(5, p.unplannedHours), sum(6, p.lostVolumeM3), sum(7, p.cost)], 'total');
  sheet.notes('Notes', [
    `Cost = lost permeate volume × the water value setting (${d.waterValuePerM3 ?? 'not set'} ${cur}/m³); lost volume = stop hours × the rated permeate flow of the asset or the nearest asset above it with one (docs/design.md §6, Downtime).`,
    'A pump that stops with its train is part of the train’s stop and counted once there, so the rows add up to the site’s total.',
    ...(p.cost === null ? ['"not known": at least one stopped asset has no rated permeate flow, so the lost volume and its cost cannot be totalled.'] : []),
    ...d.notes,
  ]);
  book.done(sheet);
}

async function writeReplacements(book: Book, c: FinanceContent, at: Layout): Promise<void> {
  const cur = c.currency;
  const sheet = book.sheet(REPLACEMENTS, {
    table: true,
    columns: [
      { header: 'Removed (site time)', kind: 'datetime', width: 17 },
      { header: 'Train', kind: 'text', width: 8 },
      { header: 'Stage', kind: 'text', width: 10 },
      { header: 'Vessel', kind: 'text', width: 14 },
      { header: 'Position', kind: 'integer', width: 9 },
      { header: 'Serial', kind: 'text', width: 16 },
      { header: 'Model', kind: 'text', width: 14 },
      { header: 'Installed (site time)', kind: 'datetime', width: 17 },
      { header: 'Age at removal (days)', kind: 'days', width: 12 },
      { header: 'Removal reason', kind: 'text', width: 13 },
      { header: 'Life-ending', kind: 'flag', width: 10 },
      { header: 'Replaced by', kind: 'text', width: 16 },
      { header: 'Replaced (site time)', kind: 'datetime', width: 17 },
      { header: `Cost (${cur})`, kind: 'money', width: 12 },
    ],
  });
  for (const r of c.replacements) {
    await sheet.row([r.removedAt, r.train, r.stage, r.vessel, r.position, r.serial, r.model, r.installedAt, r.ageDays, r.reason, r.lifeEnding, r.replacedBy, r.replacedAt, r.replacedBy ? c.elementUnitCost : null]);
  }
  const first = 2;
  const last = at.replacementTotal - 1;
  const replaced = c.replacements.filter((r) => r.replacedBy).length;
  const none = last < first;
  await sheet.row(
    [
      'Total',
      null,
      null,
      null,
      null,
      new Formula(none ? '0' : `COUNTA(F${first}:F${last})`, c.replacements.length),
      null,
      null,
      null,
      null,
      new Formula(none ? '0' : `COUNTIF(K${first}:K${last},"yes")`, c.lifeEndingEvents),
      new Formula(none ? '0' : `COUNTA(L${first}:L${last})`, replaced),
      null,
      new Formula(sumOf(14, first, last), replaced * c.elementUnitCost),
    ],
    'total',
    formatsAt({ 5: 'integer', 10: 'integer', 11: 'integer' }),
  );
  sheet.notes('Notes', [
    `Each element removed in the window; the cost of a replacement is the element cost setting (${c.elementUnitCost} ${cur}), as in the replacement forecast.`,
    'Life-ending: removed as failed, performance or damaged (docs/design.md §6, Element life) — the events the forecast predicts. Their total is the element-life answer’s count of events in the window.',
    'Replaced by: the element installed in the same vessel position after the removal and before the window’s end.',
  ]);
  book.done(sheet);
}

async function writeBudget(book: Book, c: FinanceContent, at: Layout): Promise<void> {
  const cur = c.currency;
  const f = c.forecast;
  const sheet = book.sheet(BUDGET, {
    table: true,
    columns: [
      { header: 'Month', kind: 'text', width: 10 },
      { header: 'From (site time)', kind: 'date', width: 12 },
      { header: 'Until (not included)', kind: 'date', width: 12 },
      { header: 'Part of a month', kind: 'flag', width: 9 },
      { header: 'Expected replacements', kind: 'decimal', width: 14 },
      { header: 'Replacements, low', kind: 'decimal', width: 13 },
      { header: 'Replacements, high', kind: 'decimal', width: 13 },
      { header: `Expected cost (${cur})`, kind: 'money', width: 15 },
      { header: `Cost, low (${cur})`, kind: 'money', width: 14 },
      { header: `Cost, high (${cur})`, kind: 'money', width: 14 },
    ],
  });
  const months = budgetMonths(f);
  for (const m of months) {
    await sheet.row([m.label, new Date(m.from), new Date(m.to), m.partial ?? false, m.expectedCount, m.countLower, m.countUpper, m.expectedCost, m.costLower, m.costUpper]);
  }
  const first = 2;
  const last = at.budgetTotal - 1;
  const all = f.groups.find((g) => g.key === 'all');
  const total = all?.total ?? { ...sumTotals(f), countLower: null, countUpper: null, costLower: null, costUpper: null };
  await sheet.row(
    ['Total', null, null, null, new Formula(sumOf(5, first, last), total.expectedCount), total.countLower, total.countUpper, new Formula(sumOf(8, first, last), total.expectedCost), total.costLower, total.costUpper],
    'total',
  );
  const w = all?.weibull;
  sheet.notes('Notes', [
    `Elements in service at the start (${new Date(f.asOf).toISOString()}): ${f.inService ?? all?.inService ?? 0}.`,
    ...(w ? [`Weibull fit of the site's element lives over the window: shape β = ${w.shape.toFixed(3)}, scale η = ${w.scaleDays.toFixed(1)} days (${all?.fitSource === 'pooled' ? 'pooled fit' : 'own fit'}).`] : []),
    `Band (low–high): ${f.bandMethod.replace(/\.?\s*$/, '.')} The band of the total is the forecast's own; it is not the sum of the monthly bands.`,
    'Expected count = the sum over the elements in service of the probability of a life-ending event in the month, given their age; cost = count × the element cost setting (docs/design.md §6, Replacement forecast).',
    ...(f.notes ?? []),
  ]);
  sheet.notes('Cautions for the replacement work', f.cautions ?? []);
  book.done(sheet);
}

export async function writeFinance(book: Book, c: FinanceContent): Promise<void> {
  const at = layoutOf(c);
  await writeCover(book, c.cover);
  await writeSummary(book, c, at);
  await writeCost(book, c, at);
  await writeDowntime(book, c, at);
  await writeReplacements(book, c, at);
  await writeBudget(book, c, at);
}
