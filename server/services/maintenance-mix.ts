// Maintenance mix: the work orders of the scope and window, the crews' weekly capacity (setting) and
// the permeate produced (hourly rollups of permeate-flow tags) — then shared/kpi/maintenance-mix.ts.
import type { Settings } from '#shared/schemas/settings.ts';
import type { BeforeFreshness } from '#shared/schemas/common.ts';
import { maintenanceMix, type MixWorkOrder } from '#shared/kpi/maintenance-mix.ts';
import type { WorkOrderStatus, WorkOrderType } from '#shared/schemas/enums.ts';
import type { Provenance } from '#shared/schemas/answer.ts';
import type { MaintenanceMixQuery, MaintenanceMixReport } from '#shared/schemas/maintenance-mix.ts';
import type { Db } from '../db/client.ts';
import type { AssetRecord } from '../db/queries/assets.ts';
import { integrateHourlyMeans } from '../db/queries/sample-hourly.ts';
import { listTags, type TagRow } from '../db/queries/tags.ts';
import { listWorkOrdersOpenDuring } from '../db/queries/work-orders.ts';
import { ancestry, resolveScope, subtree, type KpiScope } from './scope.ts';
import { PROVENANCE_CAP } from './provenance.ts';

const HOUR_MS = 3_600_000;


export interface ProducedVolume {
  /** m³ of permeate in the window; null when it cannot be known. */
  producedM3: number | null;
  /** Why producedM3 is null. */
  reason: string | null;
  /** Trains whose production is counted. */
  trains: string[];
  tags: string[];
  notes: string[];
}

/**
 * The trains whose production a scope's maintenance is set against: the trains in scope; for an
 * asset below a train (a stage, vessel or pump), the train above it.
 */
function trainsFor(scope: KpiScope): AssetRecord[] {
  const inScope = scope.inScope.filter((a) => a.kind === 'train');
  if (inScope.length > 0 || scope.asset === null) return inScope;
  const above = ancestry(scope.assets, scope.asset).find((a) => a.kind === 'train');
  return above ? [above] : [];
}

/**
 * Permeate tags of a train: its own permeate_flow tags; without one, those of the stages below it
 * (stages in series each make permeate, so their flows add up). Never both, which would count twice.
 */
function permeateTagsOf(train: AssetRecord, assets: AssetRecord[], tags: TagRow[]): TagRow[] {
  const flows = tags.filter((t) => t.quantity === 'permeate_flow');
  const own = flows.filter((t) => t.assetId === train.id);
  if (own.length > 0) return own;
  const stageIds = new Set(subtree(assets, train).filter((a) => a.kind === 'stage').map((a) => a.id));
  return flows.filter((t) => stageIds.has(t.assetId));
}

/**
 * Permeate produced in [from, to), m³: Σ over the permeate-flow tags of the trains (see
 * `permeateTagsOf`) of hourly mean flow (m³/h, good samples only) × the hours of that hour inside
 * the window. An hour without a good sample adds nothing (said in the notes when the window is not
 * fully covered). Null with a reason when a train has no permeate-flow tag, when there is no train,
 * or when the tags have no hourly data in the window (historian not imported or `osmia refresh` not run).
 */
async function producedVolume(db: Db, scope: KpiScope, from: Date, to: Date): Promise<ProducedVolume> {
  const trains = trainsFor(scope);
  const none = (reason: string): ProducedVolume => ({ producedM3: null, reason, trains: trains.map((t) => t.code), tags: [], notes: [] });
  if (trains.length === 0) return none('There is no train in this scope, so no permeate production to set the cost against.');
  const tags = await listTags(db.$client, scope.site.id);
  const byTrain = trains.map((train) => ({ train, tags: permeateTagsOf(train, scope.assets, tags) }));
  const missing = byTrain.filter((t) => t.tags.length === 0).map((t) => t.train.code);
  if (missing.length > 0) {
    return none(`No permeate_flow tag on train ${missing.join(', ')} or its stages, so the volume produced is not known.`);
  }
  const used = byTrain.flatMap((t) => t.tags);
  const integrals = await integrateHourlyMeans(db.$client, used.map((t) => t.id), from, to);
  if (integrals.length === 0) {
    return {
      ...none('The permeate_flow tags have no hourly data in the window (import the historian, then run osmia refresh).'),
      tags: used.map((t) => t.name),
    };
  }
  const windowHours = (to.getTime() - from.getTime()) / HOUR_MS;
  const notes: string[] = [];
  const byId = new Map(integrals.map((i) => [i.tagId, i]));
  for (const tag of used) {
    const covered = byId.get(tag.id)?.hoursCovered ?? 0;
    if (covered < windowHours - 1e-9) {
      notes.push(
        `Permeate tag ${tag.name} has hourly data for ${covered.toFixed(1)} of the window's ${windowHours.toFixed(1)} h; ` +
          'hours without data add no production, so the cost per m³ may be overstated.',
      );
    }
  }
  return {
    producedM3: integrals.reduce((s, i) => s + i.integral, 0),
    reason: null,
    trains: trains.map((t) => t.code),
    tags: used.map((t) => t.name),
    notes,
  };
}

/**
 * Maintenance mix over [from, to) (docs/design.md §6; EN 15341 indicator families, from memory): planned
 * (preventive, predictive, inspection) vs reactive (corrective) share of the labour hours of closed
 * work orders completed in the window, PM compliance (`pmComplianceDefinition`), backlog at the
 * window end in hours and in weeks of crew capacity (settings.crewHoursPerWeek), and maintenance
 * cost (labour + parts) per m³ of permeate produced (`producedVolume`). Work orders: those on the
 * asset and everything below it (the whole site without an asset). Degenerate input: every ratio with
 * a zero or unknown denominator is null with a sentence saying why; a site with no data at all gets
 * an empty window ending now.
 */
export async function getMaintenanceMix(db: Db, query: MaintenanceMixQuery, settings: Settings): Promise<BeforeFreshness<MaintenanceMixReport>> {
  const scope = await resolveScope(db, query);
  const notes: string[] = [];
  // The service may read the clock; only shared/ may not. Without any data there is no other bound.
  const to = scope.to ?? new Date();
  const from = scope.from ?? to;
  if (scope.from === null && scope.to === null) notes.push('The site has no data yet, so the window is empty.');
  const orders = await listWorkOrdersOpenDuring(
    db.$client,
    scope.site.id,
    scope.inScope.map((a) => a.id),
    from,
    to,
  );
  const workOrders: MixWorkOrder[] = orders.map((o) => ({
    woNumber: o.woNumber,
    type: o.type as WorkOrderType,
    status: o.status as WorkOrderStatus,
    reportedAt: o.reportedAt,
    startedAt: o.startedAt,
    completedAt: o.completedAt,
    labourHours: o.labourHours,
    labourCost: o.labourCost,
    partsCost: o.partsCost,
  }));
  const produced = await producedVolume(db, scope, from, to);
  const mix = maintenanceMix({
    window: { from, to },
    workOrders,
    crewCapacityHoursPerWeek: settings.crewHoursPerWeek,
    producedM3: produced.producedM3,
    cancelledPmCountsAsMissed: query.cancelledPmCountsAsMissed,
  });
  const numbers = orders.map((o) => o.woNumber);
  const provenance: Provenance & { workOrderCount: number; trains: string[] } = {
    workOrders: numbers.slice(0, PROVENANCE_CAP),
    workOrderCount: numbers.length,
    tags: produced.tags,
    trains: produced.trains,
    windows: [{ from: from.toISOString(), to: to.toISOString(), what: 'maintenance-mix window' }],
  };
  return {
    site: scope.site.code,
    ...(scope.asset ? { asset: scope.asset.code } : {}),
    from: mix.from,
    to: mix.to,
    labour: mix.labour,
    pmCompliance: mix.pmCompliance,
    backlog: mix.backlog,
    cost: produced.producedM3 === null ? { ...mix.cost, reason: produced.reason } : mix.cost,
    currency: settings.currency,
    notes: [...notes, ...mix.notes, ...produced.notes],
    provenance,
  };
}
