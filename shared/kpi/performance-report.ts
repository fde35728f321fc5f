// The performance answer (docs/design.md §6 Membrane performance, ASTM D4516) from the rows its service
// loads (server/services/performance.ts): which tags each stage is read from, its daily points, the
// resets of its baseline (cleanings, element change-outs), the normalized series (performance.ts), the
// summary of each point, and the provenance.
import { TZDate } from '@date-fns/tz';
import { addDays } from 'date-fns';
import type { Provenance } from '../schemas/answer.ts';
import type { BeforeFreshness } from '../schemas/common.ts';
import type { AssetKind, Quantity } from '../schemas/enums.ts';
import { summaryNormalizedKeys, summaryStateKeys, type PerformanceQuery, type PerformanceReport } from '../schemas/performance.ts';
import type { Settings } from '../schemas/settings.ts';
import { ancestry, subtree, type TreeAsset } from './asset-tree.ts';
import {
  elementChangeOuts,
  normalizePerformance,
  stageState,
  type BaselineReset,
  type PerformancePoint,
  type PerformanceSettings,
} from './performance.ts';
import { capped } from './provenance.ts';
import type { WorkOrderRecord } from './work-orders.ts';

/** An asset of the site as the performance rules read it. */
export interface PerformanceAsset extends TreeAsset {
  code: string;
  kind: AssetKind;
  /** Element positions of a vessel; null for other assets (or when the register has none). */
  elementCapacity: number | null;
}

/** A historian tag of the site. */
export interface PerformanceTag {
  id: number;
  name: string;
  assetId: number;
  assetCode: string;
  quantity: Quantity;
}

/** The mean of one tag over the qualifying hours of one day (local midnight of the site's zone, as an instant). */
export interface DailyMean {
  day: Date;
  tagId: number;
  mean: number;
  /** Qualifying hours averaged. */
  hours: number;
}

/** An element install in one of a stage's vessels. */
export interface StageInstall {
  serial: string;
  vesselId: number;
  position: number;
  installedAt: Date;
}

/** What the cleaning rule reads of a preventive work order. */
export type CleaningCandidate = Pick<WorkOrderRecord, 'woNumber' | 'status' | 'description' | 'outOfServiceTo' | 'completedAt'>;

/** The rows of one stage whose tags are complete (`stageTags`). */
export interface PerformanceStageRows {
  /**
   * Daily means of the stage's tags over the window's whole hours in which its run-status tag ran the whole
   * hour and every needed tag has data (server/db/queries/sample-hourly.ts `dailyMeansWhileRunning`).
   */
  days: readonly DailyMean[];
  /** The same over the baseline lookback before the window (`baselineLookback`); empty when none is needed. */
  daysBefore: readonly DailyMean[];
  /** First instant of the run-status tag's data (sample coverage); null without. */
  runStatusFrom: Date | null;
  /** Element installs in the stage's vessels (`stageVessels`) before the window end. */
  installs: readonly StageInstall[];
  /** Preventive work orders on the stage or its train reported before the window end. */
  preventiveOrders: readonly CleaningCandidate[];
}

/** What the performance answer is built from: plain rows, as server/services/performance.ts reads them. */
export interface PerformanceReportInput {
  site: string;
  /** The site's IANA time zone: points are its calendar days. */
  timeZone: string;
  /** Every asset of the site. */
  assets: readonly PerformanceAsset[];
  /** The asset asked about and every asset below it (the whole site without one); its stages are normalized. */
  inScope: readonly PerformanceAsset[];
  /** The site's tags, ordered by name. */
  tags: readonly PerformanceTag[];
  /** By stage code, the rows of each stage whose tags are complete. */
  stages: ReadonlyMap<string, PerformanceStageRows>;
}

/** The window of a performance question (null bounds when the site has no data to bound it) and its options. */
export interface PerformanceWindow extends Pick<PerformanceQuery, 'feedBrineAverage' | 'viscosityCorrection' | 'detail'> {
  from: Date | null;
  to: Date | null;
}

/** The quantities a stage needs for a normalized point, and the PerformancePoint field each fills. */
const requiredQuantities = {
  feed_pressure: 'pf',
  concentrate_pressure: 'pc',
  permeate_pressure: 'pp',
  feed_flow: 'qf',
  permeate_flow: 'qp',
  feed_conductivity: 'cf',
  permeate_conductivity: 'cp',
  feed_temperature: 'tempC',
} as const satisfies Partial<Record<Quantity, keyof PerformancePoint>>;
type RequiredQuantity = keyof typeof requiredQuantities;
const required = Object.keys(requiredQuantities) as RequiredQuantity[];

/**
 * A cleaning, for the baseline (docs/design.md §6: "the first running day after the last cleaning or change-out"): a
 * preventive work order, not cancelled, on the stage or its train, whose description says clean-in-place,
 * CIP or cleaning — /clean[- ]in[- ]place|\bCIP\b|cleaning/i. It resets the baseline at the end of its
 * out-of-service window, else at its completion; one with neither has not happened yet and is left out.
 */
export const cleaningDescription = /clean[- ]in[- ]place|\bCIP\b|cleaning/i;

/** Osmia's settings under the names shared/kpi/performance.ts uses, plus the query's variants. */
export function performanceSettingsOf(
  settings: Settings,
  options: Pick<PerformanceQuery, 'feedBrineAverage' | 'viscosityCorrection'>,
): Partial<PerformanceSettings> {
  return {
    tdsFactor: settings.tdsPerMicroSiemens,
    osmoticBarPerMgL: settings.osmoticBarPerMgL,
    uBelow25K: settings.tcfUBelow25K,
    uAtOrAbove25K: settings.tcfUAbove25K,
    flowDropPct: settings.alertFlowDropPct,
    dpRisePct: settings.alertDpRisePct,
    saltPassageRisePct: settings.alertSaltPassageRisePct,
    feedBrineAverage: options.feedBrineAverage,
    dpViscosityCorrection: options.viscosityCorrection,
  };
}

/** A day of the site's calendar, for notes a person reads ("2025-01-06"). */
export function formatDay(time: Date, timeZone: string): string {
  return new TZDate(time.getTime(), timeZone).toISOString().slice(0, 10);
}

/** The site's tags by the id of the asset they are on, in name order. */
export function tagsByAsset<T extends PerformanceTag>(tags: readonly T[]): Map<number, T[]> {
  const out = new Map<number, T[]>();
  for (const tag of tags) (out.get(tag.assetId) ?? out.set(tag.assetId, []).get(tag.assetId)!).push(tag);
  return out;
}

/** The tags a stage is normalized from (`stageTags`). */
export interface StageTags<T extends PerformanceTag> {
  /** The stage's own run-status tag, else its nearest ancestor's (the first by name); null without one. */
  runTag: T | null;
  /** The first tag by name of each quantity on the stage itself. */
  byQuantity: Map<Quantity, T>;
  /** Needed quantities without a tag on the stage. */
  missing: RequiredQuantity[];
  /** The stage's tags used, run status left out. */
  used: T[];
  /** The needed tags, in the order of the needed quantities, when none is missing. */
  needed: T[];
  /** A note for each further tag of a quantity on the stage, left unused. */
  notes: string[];
}

/**
 * The tags of a stage: those on the stage asset, the first by name of each quantity (a note names each
 * other one); run status from the stage's own run-status tag, else its train's (the nearest ancestor with
 * one); concentrate flow when there is a tag for it. Complete when every needed quantity has a tag and
 * there is a run-status tag.
 */
export function stageTags<A extends PerformanceAsset, T extends PerformanceTag>(stage: A, assets: readonly A[], byAsset: ReadonlyMap<number, readonly T[]>): StageTags<T> {
  const firstTag = (assetId: number, quantity: Quantity) => (byAsset.get(assetId) ?? []).find((t) => t.quantity === quantity) ?? null;
  const runTag = ancestry(assets, stage).map((a) => firstTag(a.id, 'run_status')).find((t) => t !== null) ?? null;
  const byQuantity = new Map<Quantity, T>();
  const notes: string[] = [];
  for (const tag of byAsset.get(stage.id) ?? []) {
    if (byQuantity.has(tag.quantity)) notes.push(`Several ${tag.quantity} tags on ${stage.code}: ${byQuantity.get(tag.quantity)!.name} is used, ${tag.name} is not.`);
    else byQuantity.set(tag.quantity, tag);
  }
  const missing = required.filter((q) => !byQuantity.has(q));
  const used = [...byQuantity.values()].filter((t) => t.quantity !== 'run_status');
  const needed = missing.length === 0 ? required.map((q) => byQuantity.get(q)!) : [];
  return { runTag, byQuantity, missing, used, needed, notes };
}

/** The vessels below a stage, whose element installs can reset its baseline. */
export function stageVessels<A extends PerformanceAsset>(assets: readonly A[], stage: A): A[] {
  return subtree(assets, stage).filter((a) => a.kind === 'vessel');
}

/** The train a stage belongs to (the nearest ancestor of kind train); null when it is under none. */
export function stageTrain<A extends PerformanceAsset>(assets: readonly A[], stage: A): A | null {
  return ancestry(assets, stage).find((a) => a.kind === 'train') ?? null;
}

/** One day's means as they are added up into a point. */
interface DayOfMeans {
  point: Partial<PerformancePoint> & { time: Date };
  hours: number;
}

/** Adds one daily mean to its day: a needed quantity's field and the day's running hours, or the measured concentrate flow. */
function addMean(day: DayOfMeans, row: DailyMean, quantityOf: ReadonlyMap<number, Quantity>): void {
  const quantity = quantityOf.get(row.tagId)!;
  if (quantity === 'concentrate_flow') day.point.qc = row.mean;
  else {
    day.point[requiredQuantities[quantity as RequiredQuantity]] = row.mean;
    day.hours = Math.max(day.hours, row.hours);
  }
}

/** The day's operating point; throws (stageState's error) when its means are not a physical operating point. */
function checkedPoint(day: DayOfMeans, settings: Partial<PerformanceSettings>): PerformancePoint {
  const p = { ...day.point, qc: day.point.qc ?? null } as PerformancePoint;
  stageState(p, settings);
  return p;
}

/**
 * Daily operating points of a stage from its daily means, sorted by day, with the running hours of each
 * day. A day whose means are not a physical operating point (e.g. permeate flow ≥ feed flow) is left out,
 * with a note naming the day in the site's calendar.
 */
function dailyPoints(
  rows: readonly DailyMean[],
  tags: StageTags<PerformanceTag>,
  settings: Partial<PerformanceSettings>,
  timeZone: string,
  notes: string[],
): { point: PerformancePoint; hours: number }[] {
  const quantityOf = new Map(tags.used.map((t) => [t.id, t.quantity]));
  const days = new Map<number, DayOfMeans>();
  for (const row of rows) {
    const day = days.get(row.day.getTime()) ?? days.set(row.day.getTime(), { point: { time: row.day }, hours: 0 }).get(row.day.getTime())!;
    addMean(day, row, quantityOf);
  }
  const out: { point: PerformancePoint; hours: number }[] = [];
  for (const day of days.values()) {
    try {
      out.push({ point: checkedPoint(day, settings), hours: day.hours });
    } catch (err) {
      notes.push(`The day of ${formatDay(day.point.time, timeZone)} is left out: ${(err as Error).message}.`);
    }
  }
  return out.sort((x, y) => x.point.time.getTime() - y.point.time.getTime());
}

/**
 * Whether a stage has a running day (a point `dailyPoints` keeps) at or before `until`. Reads the rows in
 * day order, as `dailyMeansWhileRunning` gives them, and stops at the first such day or past `until`, so a
 * long window is not read twice.
 */
function runsBy(rows: readonly DailyMean[], until: Date, tags: StageTags<PerformanceTag>, settings: Partial<PerformanceSettings>): boolean {
  const quantityOf = new Map(tags.used.map((t) => [t.id, t.quantity]));
  const valid = (day: DayOfMeans) => {
    try {
      checkedPoint(day, settings);
      return true;
    } catch {
      return false;
    }
  };
  let day: DayOfMeans | null = null;
  for (const row of rows) {
    if (day && row.day.getTime() !== day.point.time.getTime()) {
      if (valid(day)) return true;
      day = null;
    }
    if (row.day > until) return false;
    day ??= { point: { time: row.day }, hours: 0 };
    addMean(day, row, quantityOf);
  }
  return day !== null && valid(day);
}

/**
 * What can reset a stage's baseline up to the window end: cleanings (`cleaningDescription`, dated at the end
 * of the out-of-service window, else at completion) and element change-outs of at least the set share of
 * the stage's positions within the set number of days (`elementChangeOuts`; settings
 * baselineChangeOutSharePct, baselineChangeOutDays). Installs on the first day of the run-status data or
 * before it are the initial fill, not a change. Positions: the vessels' element capacities, else the
 * positions the installs name.
 */
function stageResets(
  rows: PerformanceStageRows,
  vessels: readonly PerformanceAsset[],
  to: Date,
  timeZone: string,
  settings: Pick<Settings, 'baselineChangeOutSharePct' | 'baselineChangeOutDays'>,
) {
  const firstDayEnd = rows.runStatusFrom ? addDays(new TZDate(rows.runStatusFrom.getTime(), timeZone), 1) : null;
  const installs = rows.installs.filter((e) => firstDayEnd !== null && e.installedAt.getTime() >= firstDayEnd.getTime());
  const positions = vessels.reduce((n, v) => n + (v.elementCapacity ?? 0), 0) || new Set(rows.installs.map((e) => `${e.vesselId}:${e.position}`)).size;
  const changeOuts = elementChangeOuts(
    installs.map((e) => e.installedAt),
    positions,
    { sharePct: settings.baselineChangeOutSharePct, days: settings.baselineChangeOutDays },
  );
  const cleanings = rows.preventiveOrders
    .filter((wo) => wo.status !== 'cancelled' && cleaningDescription.test(wo.description))
    .flatMap((wo) => {
      const at = wo.outOfServiceTo ?? wo.completedAt;
      return at && at < to ? [{ wo, at }] : [];
    });
  const resets: BaselineReset[] = [
    ...cleanings.map((c) => ({ at: c.at, kind: 'cleaning' as const, workOrder: c.wo.woNumber, elements: null })),
    ...changeOuts.map((c) => ({ at: c.at, kind: 'element-change-out' as const, workOrder: null, elements: c.elements })),
  ].sort((a, b) => a.at.getTime() - b.at.getTime());
  return { resets, resetTimes: resets.map((r) => r.at), installs, changeOuts, cleanings };
}

/**
 * Where a baseline before the window is looked for: the last reset before `from`, else the start of the
 * run-status data when that is before `from`; null when the window starts at the data or no reset precedes it.
 */
function baselineAnchor(resetTimes: readonly Date[], runStatusFrom: Date | null, from: Date): Date | null {
  return [...resetTimes].reverse().find((r) => r < from) ?? (runStatusFrom && runStatusFrom < from ? runStatusFrom : null);
}

/** Whether the baseline day is looked for before the window: an anchor there, and no reset in the window before its first point. */
function looksBack(anchor: Date | null, resetTimes: readonly Date[], from: Date, firstPoint: Date): anchor is Date {
  return anchor !== null && !resetTimes.some((r) => r >= from && r < firstPoint);
}

/**
 * The days before the window a stage's baseline day is read from, or null when none are needed. The baseline
 * may lie before the window — the first running day after the last reset before `from`, or of the data, when
 * that came before `from` — unless a reset inside the window comes before its first running day. It is read
 * from the 30 days after that anchor (never past `from`). `rows` need not carry `daysBefore` yet.
 */
export function baselineLookback(
  stage: PerformanceAsset,
  assets: readonly PerformanceAsset[],
  tags: StageTags<PerformanceTag>,
  rows: PerformanceStageRows,
  window: { from: Date; to: Date },
  timeZone: string,
  settings: Settings,
  options: Pick<PerformanceQuery, 'feedBrineAverage' | 'viscosityCorrection'>,
): { from: Date; to: Date } | null {
  const { resetTimes } = stageResets(rows, stageVessels(assets, stage), window.to, timeZone, settings);
  const anchor = baselineAnchor(resetTimes, rows.runStatusFrom, window.from);
  if (anchor === null) return null;
  // `looksBack` with the window's first running day, found without building every point: a reset in the
  // window comes before that day exactly when the earliest such reset has no running day at or before it.
  const firstReset = resetTimes.find((r) => r >= window.from && r < window.to);
  if (firstReset && !runsBy(rows.days, firstReset, tags, performanceSettingsOf(settings, options))) return null;
  return { from: anchor, to: new Date(Math.min(window.from.getTime(), addDays(anchor, 30).getTime())) };
}

type Stage = PerformanceReport['stages'][number];
type SeriesPoint = Stage['points'][number];

/**
 * The listed keys of an object, numbers to 5 significant digits: a daily point of a chart does not
 * need 16, and the series of a few years of four stages shrinks to a fraction (full detail keeps them).
 */
function pick<T extends object, K extends keyof T>(from: T, keys: readonly K[]): Pick<T, K> {
  return Object.fromEntries(keys.map((k) => [k, typeof from[k] === 'number' ? Number((from[k] as number).toPrecision(5)) : from[k]])) as Pick<T, K>;
}

/** A stage without figures, with what it has and why it has no more. */
function emptyStage(
  stage: PerformanceAsset,
  assets: readonly PerformanceAsset[],
  settings: Partial<PerformanceSettings>,
  runTag: PerformanceTag | null,
  used: readonly PerformanceTag[],
  missing: string[],
  reason: string,
): Stage {
  const empty = normalizePerformance([], { settings });
  return {
    asset: stage.code,
    train: stageTrain(assets, stage)?.code ?? null,
    baseline: null,
    points: [],
    latest: null,
    alerts: [],
    settings: empty.settings,
    notes: [reason],
    resets: [],
    runStatusTag: runTag?.name ?? null,
    tags: [...(runTag ? [runTag.name] : []), ...used.map((t) => t.name)],
    missingQuantities: missing,
    reason,
  };
}

/**
 * Normalized performance over [from, to) of every stage (asset of kind 'stage') in scope — below a
 * train, a stage, or the whole site. ASTM D4516 standardizes stage by stage (formulas, units and
 * sources in shared/kpi/performance.ts).
 *
 * - Points: one per day of the site's time zone, the mean of the hourly means (good samples only) of the
 *   hours when the train ran the whole hour and every needed tag of the stage has data: feed, concentrate
 *   and permeate pressure (bar), feed and permeate flow (m³/h), feed and permeate conductivity (µS/cm), feed
 *   temperature (°C); concentrate flow (m³/h) too when the stage has a tag for it (`stageTags`). A day whose
 *   means are not a physical operating point (e.g. permeate flow ≥ feed flow) is left out, with a note.
 * - Baseline: the first day of data, or the first day after the last reset: element change-outs in the
 *   stage's vessels after the first day of data (earlier installs are the initial fill) and cleanings (see
 *   `cleaningDescription`). It may lie before the window (`baselineLookback`): then it is the reference,
 *   not a point of the series.
 * - Settings: TDS factor, osmotic constant, TCF constants and alert thresholds from the plant's settings;
 *   feed-brine average and the ΔP viscosity term from the query (`performanceSettingsOf`). Alerts carry the
 *   cautions of shared/cautions.ts. `detail: 'summary'` keeps each point's charted figures (5 significant digits).
 * - Provenance: the tags used, the cleanings and the serials of the change-outs that can reset a baseline
 *   (cut to PROVENANCE_CAP), the window.
 *
 * Degenerate input: a stage without a needed tag or without run status → no figures, `reason` lists what is
 * missing; no running hours in the window → baseline null and no points (noted); no window (a site without
 * data) → every stage empty, with a note.
 */
export function buildPerformanceReport(input: PerformanceReportInput, window: PerformanceWindow, plant: Settings): BeforeFreshness<PerformanceReport> {
  const { assets, timeZone } = input;
  const stages = input.inScope.filter((a) => a.kind === 'stage');
  const settings = performanceSettingsOf(plant, window);
  const notes: string[] = [];
  const provenance = { workOrders: [] as string[], tags: [] as string[], windows: [] as Provenance['windows'], elements: [] as string[] };
  const header = { site: input.site, from: window.from?.toISOString() ?? null, to: window.to?.toISOString() ?? null };
  if (stages.length === 0) notes.push(`No asset of kind 'stage' in scope: nothing to normalize.`);
  if (!window.from || !window.to) {
    notes.push(`Site ${input.site} has no data to bound a window: give from and to, or import data first.`);
    return { ...header, stages: stages.map((s) => emptyStage(s, assets, settings, null, [], [], 'No data in the window.')), notes, provenance };
  }
  const from = window.from;
  const to = window.to;
  provenance.windows.push({ from: from.toISOString(), to: to.toISOString(), what: 'window' });

  const byAsset = tagsByAsset(input.tags);
  const answers: Stage[] = [];
  for (const stage of stages) {
    const tags = stageTags(stage, assets, byAsset);
    const { runTag, missing, used } = tags;
    const stageNotes = [...tags.notes];
    if (missing.length > 0 || !runTag) {
      const reasons = [
        ...(missing.length > 0 ? [`${stage.code} has no tag for ${missing.join(', ')}`] : []),
        ...(!runTag ? [`neither ${stage.code} nor an asset above it has a run-status tag`] : []),
      ];
      answers.push(emptyStage(stage, assets, settings, runTag, used, missing, `${reasons.join('; ')}: no normalized figures.`));
      continue;
    }
    const rows = input.stages.get(stage.code);
    if (!rows) throw new RangeError(`stages has no rows for stage ${stage.code}`);
    provenance.tags.push(runTag.name, ...used.map((t) => t.name));

    const inWindow = dailyPoints(rows.days, tags, settings, timeZone, stageNotes);
    const { resets, resetTimes, installs, changeOuts, cleanings } = stageResets(rows, stageVessels(assets, stage), to, timeZone, plant);
    provenance.elements.push(...installs.filter((e) => changeOuts.some((c) => e.installedAt >= c.from && e.installedAt <= c.at)).map((e) => e.serial));
    provenance.workOrders.push(...cleanings.map((c) => c.wo.woNumber));

    // The baseline day read from before the window (baselineLookback) goes first: the reference, not a point.
    const anchor = baselineAnchor(resetTimes, rows.runStatusFrom, from);
    const before = looksBack(anchor, resetTimes, from, inWindow[0]?.point.time ?? to)
      ? dailyPoints(rows.daysBefore, tags, settings, timeZone, stageNotes)
          .filter((p) => p.point.time >= anchor)
          .slice(0, 1)
      : [];
    const points = [...before, ...inWindow].map((p) => p.point);
    const hoursOf = new Map([...before, ...inWindow].map((p) => [p.point.time.toISOString(), p.hours]));

    const result = normalizePerformance(points, { resets, settings });
    const shown = before.length > 0 ? result.points.slice(1) : result.points;
    const baseline = result.baseline && {
      ...result.baseline,
      index: Math.max(0, result.baseline.index - before.length),
    };
    answers.push({
      asset: stage.code,
      train: stageTrain(assets, stage)?.code ?? null,
      baseline,
      points: shown.map(
        (p): SeriesPoint => ({
          ...(window.detail === 'full' ? p : { state: pick(p.state, summaryStateKeys), normalized: pick(p.normalized, summaryNormalizedKeys) }),
          runningHours: hoursOf.get(p.state.time) ?? 0,
        }),
      ),
      latest: result.latest,
      alerts: result.alerts,
      settings: result.settings,
      notes: [
        `Run status from ${runTag.name}${runTag.assetId === stage.id ? '' : ` (on ${runTag.assetCode})`}; daily means of hours the train ran throughout.`,
        ...stageNotes,
        ...result.notes,
      ],
      resets: resetTimes.map((d) => d.toISOString()),
      runStatusTag: runTag.name,
      tags: [runTag.name, ...used.map((t) => t.name)],
      missingQuantities: [],
      reason: null,
    });
  }
  const provenanceNotes: string[] = [];
  const workOrders = capped([...new Set(provenance.workOrders)], 'work orders', provenanceNotes);
  const elements = capped([...new Set(provenance.elements)], 'element serials', provenanceNotes);
  return {
    ...header,
    stages: answers,
    notes: [...notes, ...provenanceNotes],
    provenance: { workOrders, tags: [...new Set(provenance.tags)], windows: provenance.windows, elements },
  };
}
