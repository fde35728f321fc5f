// Performance KPI (docs/design.md §6, ASTM D4516): normalized permeate flow, salt passage and differential
// pressure of each stage, as % change from a baseline, with cleaning alerts and their cautions.
import type { BeforeFreshness } from '#shared/schemas/common.ts';
import { TZDate } from '@date-fns/tz';
import { addDays } from 'date-fns';
import {
  elementChangeOuts,
  normalizePerformance,
  stageState,
  type BaselineReset,
  type PerformancePoint,
  type PerformanceSettings,
} from '#shared/kpi/performance.ts';
import type { Quantity } from '#shared/schemas/enums.ts';
import type { Provenance } from '#shared/schemas/answer.ts';
import { summaryNormalizedKeys, summaryStateKeys, type PerformanceQuery, type PerformanceReport } from '#shared/schemas/performance.ts';
import type { Settings } from '#shared/schemas/settings.ts';
import type { Db } from '../db/client.ts';
import type { AssetRecord } from '../db/queries/assets.ts';
import { listElementInstalls } from '../db/queries/elements.ts';
import { coverageExtents } from '../db/queries/sample-coverage.ts';
import { dailyMeansWhileRunning } from '../db/queries/sample-hourly.ts';
import { listTags, type TagRow } from '../db/queries/tags.ts';
import { listPreventiveWorkOrders } from '../db/queries/work-orders.ts';
import { badRequest } from '../errors.ts';
import { capped } from './provenance.ts';
import { ancestry, resolveScope, subtree } from './scope.ts';

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

type Stage = PerformanceReport['stages'][number];
type Point = Stage['points'][number];

/**
 * The listed keys of an object, numbers to 5 significant digits: a daily point of a chart does not
 * need 16, and the series of a few years of four stages shrinks to a fraction (full detail keeps them).
 */
function pick<T extends object, K extends keyof T>(from: T, keys: readonly K[]): Pick<T, K> {
  return Object.fromEntries(keys.map((k) => [k, typeof from[k] === 'number' ? Number((from[k] as number).toPrecision(5)) : from[k]])) as Pick<T, K>;
}

/** One stage's answer, with what it was computed from and, when it has no figures, why. */
export type PerformanceStageAnswer = Omit<Stage, 'points'> & {
  points: (Point & { runningHours: number })[];
  runStatusTag: string | null;
  tags: string[];
  /** Needed quantities without a tag on the stage. */
  missingQuantities: string[];
  /** Why the stage has no figures; null when it has them. */
  reason: string | null;
};

export type PerformanceAnswer = Omit<BeforeFreshness<PerformanceReport>, 'stages'> & {
  stages: PerformanceStageAnswer[];
  notes: string[];
  provenance: Provenance;
};

/** Osmia's settings under the names shared/kpi/performance.ts uses, plus the query's variants. */
export function performanceSettingsOf(settings: Settings, query: PerformanceQuery): Partial<PerformanceSettings> {
  return {
    tdsFactor: settings.tdsPerMicroSiemens,
    osmoticBarPerMgL: settings.osmoticBarPerMgL,
    uBelow25K: settings.tcfUBelow25K,
    uAtOrAbove25K: settings.tcfUAbove25K,
    flowDropPct: settings.alertFlowDropPct,
    dpRisePct: settings.alertDpRisePct,
    saltPassageRisePct: settings.alertSaltPassageRisePct,
    feedBrineAverage: query.feedBrineAverage,
    dpViscosityCorrection: query.viscosityCorrection,
  };
}

/**
 * Normalized performance over [from, to) of every stage (asset of kind 'stage') of the asset asked about — a
 * train, a stage, or the whole site without one. ASTM D4516 standardizes stage by stage (formulas, units and
 * sources in shared/kpi/performance.ts).
 *
 * - Points: one per day of the site's time zone, the mean of the hourly means (`sample_hourly`, good samples
 *   only) of the hours when the train ran the whole hour — the hourly minimum of the run-status tag is 1 —
 *   and every needed tag of the stage has data: feed, concentrate and permeate pressure (bar), feed and
 *   permeate flow (m³/h), feed and permeate conductivity (µS/cm), feed temperature (°C); concentrate flow
 *   (m³/h) too when the stage has a tag for it. A stage's tags are those on the stage asset; run status is the
 *   stage's own run-status tag, else its train's (the nearest ancestor with one). A day whose means are not
 *   a physical operating point (e.g. permeate flow ≥ feed flow) is left out, with a note.
 * - Baseline: the first day of data, or the first day after the last reset: element installs in the stage's
 *   vessels after the first day of data (earlier ones are the initial fill) and cleanings (see
 *   `cleaningDescription`).
 * - Settings: TDS factor, osmotic constant, TCF constants and alert thresholds from the plant's settings;
 *   feed-brine average and the ΔP viscosity term from the query. Alerts carry the cautions of
 *   shared/cautions.ts.
 *
 * Degenerate input: a stage without a needed tag or without run status → no figures, `reason` lists what is
 * missing; no running hours in the window → baseline null and no points (noted); an asset that is neither a
 * train nor a stage and has no stage below it → 400.
 */
export async function getPerformance(db: Db, query: PerformanceQuery, plant: Settings): Promise<PerformanceAnswer> {
  const scope = await resolveScope(db, query);
  const { site, assets, asset, inScope } = scope;
  const stages = inScope.filter((a) => a.kind === 'stage');
  if (asset && stages.length === 0 && asset.kind !== 'train') {
    throw badRequest('bad-request', `Performance is computed per stage: ${asset.code} is a ${asset.kind}; give a train or a stage.`);
  }
  const settings = performanceSettingsOf(plant, query);
  const notes: string[] = [];
  const provenance: Provenance = { workOrders: [], tags: [], windows: [], elements: [] };
  const header = { site: site.code, from: scope.from?.toISOString() ?? null, to: scope.to?.toISOString() ?? null };
  if (stages.length === 0) notes.push(`No asset of kind 'stage' in scope: nothing to normalize.`);
  if (!scope.from || !scope.to) {
    notes.push(`Site ${site.code} has no data to bound a window: give from and to, or import data first.`);
    return { ...header, stages: stages.map((s) => emptyStage(s, assets, settings, null, [], [], 'No data in the window.')), notes, provenance };
  }
  const from = scope.from;
  const to = scope.to;
  provenance.windows.push({ from: from.toISOString(), to: to.toISOString(), what: 'window' });

  const tagsByAsset = new Map<number, TagRow[]>();
  for (const tag of await listTags(db.$client, site.id)) {
    (tagsByAsset.get(tag.assetId) ?? tagsByAsset.set(tag.assetId, []).get(tag.assetId)!).push(tag);
  }
  const firstTag = (assetId: number, quantity: Quantity) => (tagsByAsset.get(assetId) ?? []).find((t) => t.quantity === quantity) ?? null;

  const answers: PerformanceStageAnswer[] = [];
  for (const stage of stages) {
    const stageNotes: string[] = [];
    const line = ancestry(assets, stage);
    const runTag = line.map((a) => firstTag(a.id, 'run_status')).find((t) => t !== null) ?? null;
    const byQuantity = new Map<Quantity, TagRow>();
    for (const tag of tagsByAsset.get(stage.id) ?? []) {
      if (byQuantity.has(tag.quantity)) stageNotes.push(`Several ${tag.quantity} tags on ${stage.code}: ${byQuantity.get(tag.quantity)!.name} is used, ${tag.name} is not.`);
      else byQuantity.set(tag.quantity, tag);
    }
    const missing = required.filter((q) => !byQuantity.has(q));
    const used = [...byQuantity.values()].filter((t) => t.quantity !== 'run_status');
    if (missing.length > 0 || !runTag) {
      const reasons = [
        ...(missing.length > 0 ? [`${stage.code} has no tag for ${missing.join(', ')}`] : []),
        ...(!runTag ? [`neither ${stage.code} nor an asset above it has a run-status tag`] : []),
      ];
      answers.push(emptyStage(stage, assets, settings, runTag, used, missing, `${reasons.join('; ')}: no normalized figures.`));
      continue;
    }
    provenance.tags.push(runTag.name, ...used.map((t) => t.name));

    const requiredTags = required.map((q) => byQuantity.get(q)!);
    const concentrate = byQuantity.get('concentrate_flow') ?? null;
    const quantityOf = new Map(used.map((t) => [t.id, t.quantity]));
    /** Daily operating points of the stage over [a, b), with the running hours of each day. */
    const readPoints = async (a: Date, b: Date) => {
      const rows = await dailyMeansWhileRunning(db.$client, {
        runTagId: runTag.id,
        requiredTagIds: requiredTags.map((t) => t.id),
        optionalTagIds: concentrate ? [concentrate.id] : [],
        from: a,
        to: b,
        timeZone: site.timeZone,
      });
      const days = new Map<number, { point: Partial<PerformancePoint> & { time: Date }; hours: number }>();
      for (const row of rows) {
        const day = days.get(row.day.getTime()) ?? days.set(row.day.getTime(), { point: { time: row.day }, hours: 0 }).get(row.day.getTime())!;
        const quantity = quantityOf.get(row.tagId)!;
        if (quantity === 'concentrate_flow') day.point.qc = row.mean;
        else {
          day.point[requiredQuantities[quantity as RequiredQuantity]] = row.mean;
          day.hours = Math.max(day.hours, row.hours);
        }
      }
      const out: { point: PerformancePoint; hours: number }[] = [];
      for (const { point, hours } of days.values()) {
        const p = { ...point, qc: point.qc ?? null } as PerformancePoint;
        try {
          stageState(p, settings);
        } catch (err) {
          stageNotes.push(`The day of ${formatDay(p.time, site.timeZone)} is left out: ${(err as Error).message}.`);
          continue;
        }
        out.push({ point: p, hours });
      }
      return out.sort((x, y) => x.point.time.getTime() - y.point.time.getTime());
    };
    const inWindow = await readPoints(from, to);

    // Resets: cleanings, and element change-outs of at least the set share of the stage's positions within
    // the set number of days. Installs on the first day of the run-status data or before it are the
    // initial fill, not a change.
    const vessels = subtree(assets, stage).filter((a) => a.kind === 'vessel');
    const dataFrom = (await coverageExtents(db.$client, [runTag.id])).get(runTag.id)?.from ?? null;
    const firstDayEnd = dataFrom ? addDays(new TZDate(dataFrom.getTime(), site.timeZone), 1) : null;
    const allInstalls = await listElementInstalls(db.$client, site.id, vessels.map((v) => v.id), to);
    const installs = allInstalls.filter((e) => firstDayEnd !== null && e.installedAt.getTime() >= firstDayEnd.getTime());
    const positions = vessels.reduce((n, v) => n + (v.elementCapacity ?? 0), 0) || new Set(allInstalls.map((e) => `${e.vesselId}:${e.position}`)).size;
    const changeOuts = elementChangeOuts(
      installs.map((e) => e.installedAt),
      positions,
      { sharePct: plant.baselineChangeOutSharePct, days: plant.baselineChangeOutDays },
    );
    const train = line.find((a) => a.kind === 'train') ?? null;
    const cleanings = (await listPreventiveWorkOrders(db.$client, site.id, [stage.id, ...(train ? [train.id] : [])], to))
      .filter((wo) => wo.status !== 'cancelled' && cleaningDescription.test(wo.description))
      .flatMap((wo) => {
        const at = wo.outOfServiceTo ?? wo.completedAt;
        return at && at < to ? [{ wo, at }] : [];
      });
    const resets: BaselineReset[] = [
      ...cleanings.map((c) => ({ at: c.at, kind: 'cleaning' as const, workOrder: c.wo.woNumber, elements: null })),
      ...changeOuts.map((c) => ({ at: c.at, kind: 'element-change-out' as const, workOrder: null, elements: c.elements })),
    ].sort((a, b) => a.at.getTime() - b.at.getTime());
    const resetTimes = resets.map((r) => r.at);
    provenance.elements!.push(...installs.filter((e) => changeOuts.some((c) => e.installedAt >= c.from && e.installedAt <= c.at)).map((e) => e.serial));
    provenance.workOrders.push(...cleanings.map((c) => c.wo.woNumber));

    // The baseline may lie before the window (the first running day after the last reset, or of the data,
    // that came before `from`): its day is read from the 30 days after that anchor and goes first.
    const anchor = [...resetTimes].reverse().find((r) => r < from) ?? (dataFrom && dataFrom < from ? dataFrom : null);
    const before = anchor && !resetTimes.some((r) => r >= from && r < (inWindow[0]?.point.time ?? to))
      ? (await readPoints(anchor, new Date(Math.min(from.getTime(), addDays(anchor, 30).getTime())))).filter((p) => p.point.time >= anchor).slice(0, 1)
      : [];
    const points = [...before, ...inWindow].map((p) => p.point);
    const hoursOf = new Map([...before, ...inWindow].map((p) => [p.point.time.toISOString(), p.hours]));

    const result = normalizePerformance(points, { resets, settings });
    // The baseline day read from before the window is the reference, not a point of the window.
    const shown = before.length > 0 ? result.points.slice(1) : result.points;
    const baseline = result.baseline && {
      ...result.baseline,
      index: Math.max(0, result.baseline.index - before.length),
    };
    answers.push({
      asset: stage.code,
      train: train?.code ?? null,
      baseline,
      points: shown.map((p) => ({
        ...(query.detail === 'full' ? p : { state: pick(p.state, summaryStateKeys), normalized: pick(p.normalized, summaryNormalizedKeys) }),
        runningHours: hoursOf.get(p.state.time) ?? 0,
      })),
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
  provenance.tags = [...new Set(provenance.tags)];
  provenance.workOrders = capped([...new Set(provenance.workOrders)], 'work orders', provenanceNotes);
  provenance.elements = capped([...new Set(provenance.elements)], 'element serials', provenanceNotes);
  return { ...header, stages: answers, notes: [...notes, ...provenanceNotes], provenance };
}

/** A day of the site's calendar, for notes a person reads ("2025-01-06"). */
function formatDay(time: Date, timeZone: string): string {
  return new TZDate(time.getTime(), timeZone).toISOString().slice(0, 10);
}

function emptyStage(
  stage: AssetRecord,
  assets: AssetRecord[],
  settings: Partial<PerformanceSettings>,
  runTag: TagRow | null,
  used: TagRow[],
  missing: string[],
  reason: string,
): PerformanceStageAnswer {
  const empty = normalizePerformance([], { settings });
  return {
    asset: stage.code,
    train: ancestry(assets, stage).find((a) => a.kind === 'train')?.code ?? null,
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
