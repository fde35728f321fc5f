// Performance KPI (docs/design.md §6, ASTM D4516): the rows each stage's normalized series is built from —
// daily means of its tags while its train ran, the start of its run-status data, its element installs
// and the preventive work orders that may be cleanings — then `buildPerformanceReport`
// (shared/kpi/performance-report.ts) applies the rules.
import {
  baselineLookback,
  buildPerformanceReport,
  stageTags,
  stageTrain,
  stageVessels,
  tagsByAsset,
  type PerformanceReportInput,
  type PerformanceStageRows,
} from '#shared/kpi/performance-report.ts';
import type { BeforeFreshness } from '#shared/schemas/common.ts';
import type { PerformanceQuery, PerformanceReport } from '#shared/schemas/performance.ts';
import type { Settings } from '#shared/schemas/settings.ts';
import type { Db } from '../db/client.ts';
import { listElementInstalls } from '../db/queries/elements.ts';
import { coverageExtents } from '../db/queries/sample-coverage.ts';
import { dailyMeansWhileRunning } from '../db/queries/sample-hourly.ts';
import { listTags } from '../db/queries/tags.ts';
import { listPreventiveWorkOrders } from '../db/queries/work-orders.ts';
import { badRequest } from '../errors.ts';
import { resolveScope } from './scope.ts';
import { workOrderRecords } from './work-orders.ts';

/** The performance answer as the service computes it: exactly the schema's type, before freshness. */
export type PerformanceAnswer = BeforeFreshness<PerformanceReport>;

/**
 * What the performance answer over [from, to) is built from. For each stage in scope whose tags are complete
 * (`stageTags`): the daily means of its tags over the window (`dailyMeansWhileRunning`: whole hours the
 * run-status tag ran throughout, every needed tag with data), the first instant of its run-status data, the
 * element installs in its vessels and the preventive work orders on it or its train before the window end,
 * and — where its baseline may lie before the window (`baselineLookback`) — the daily means there. A site
 * with no data to bound a window reads nothing more than its scope; an asset that is neither a train nor a
 * stage and has no stage below it is a 400.
 */
export async function loadPerformanceInput(
  db: Db,
  query: PerformanceQuery,
  settings: Settings,
): Promise<{ input: PerformanceReportInput; from: Date | null; to: Date | null }> {
  const scope = await resolveScope(db, query);
  const { site, assets, asset, inScope, from, to } = scope;
  const stages = inScope.filter((a) => a.kind === 'stage');
  if (asset && stages.length === 0 && asset.kind !== 'train') {
    throw badRequest('bad-request', `Performance is computed per stage: ${asset.code} is a ${asset.kind}; give a train or a stage.`);
  }
  const input: PerformanceReportInput = { site: site.code, timeZone: site.timeZone, assets, inScope, tags: [], stages: new Map() };
  if (!from || !to) return { input, from, to };

  const tags = await listTags(db.$client, site.id);
  const byAsset = tagsByAsset(tags);
  const rowsOf = new Map<string, PerformanceStageRows>();
  for (const stage of stages) {
    const plan = stageTags(stage, assets, byAsset);
    const runTag = plan.runTag;
    if (!runTag || plan.missing.length > 0) continue;
    const concentrate = plan.byQuantity.get('concentrate_flow') ?? null;
    const readDays = (a: Date, b: Date) =>
      dailyMeansWhileRunning(db.$client, {
        runTagId: runTag.id,
        requiredTagIds: plan.needed.map((t) => t.id),
        optionalTagIds: concentrate ? [concentrate.id] : [],
        from: a,
        to: b,
        timeZone: site.timeZone,
      });
    const days = await readDays(from, to);
    const runStatusFrom = (await coverageExtents(db.$client, [runTag.id])).get(runTag.id)?.from ?? null;
    const installs = await listElementInstalls(db.$client, site.id, stageVessels(assets, stage).map((v) => v.id), to);
    const train = stageTrain(assets, stage);
    const orders = await listPreventiveWorkOrders(db.$client, site.id, [stage.id, ...(train ? [train.id] : [])], to);
    const rows: PerformanceStageRows = { days, daysBefore: [], runStatusFrom, installs, preventiveOrders: workOrderRecords(orders, assets) };
    const lookback = baselineLookback(stage, assets, plan, rows, { from, to }, site.timeZone, settings, query);
    rowsOf.set(stage.code, lookback ? { ...rows, daysBefore: await readDays(lookback.from, lookback.to) } : rows);
  }
  return { input: { ...input, tags, stages: rowsOf }, from, to };
}

/**
 * Normalized performance over [from, to) of every stage of the asset asked about — a train, a stage, or
 * the whole site without one: `loadPerformanceInput`, then `buildPerformanceReport` (ASTM D4516 stage by
 * stage; alerts carry the cautions of shared/cautions.ts).
 */
export async function getPerformance(db: Db, query: PerformanceQuery, plant: Settings): Promise<PerformanceAnswer> {
  const { input, from, to } = await loadPerformanceInput(db, query, plant);
  return buildPerformanceReport(input, { from, to, feedBrineAverage: query.feedBrineAverage, viscosityCorrection: query.viscosityCorrection, detail: query.detail }, plant);
}
