// The maintenance-mix answer (docs/design.md §6 Maintenance mix) from the rows its service loads
// (server/services/maintenance-mix.ts): the window, the trains whose permeate the cost is set against and
// the volume they produced, the mix itself (maintenance-mix.ts) and the provenance.
import type { Provenance } from '../schemas/answer.ts';
import type { BeforeFreshness } from '../schemas/common.ts';
import type { AssetKind, Quantity } from '../schemas/enums.ts';
import type { MaintenanceMixReport } from '../schemas/maintenance-mix.ts';
import type { Settings } from '../schemas/settings.ts';
import { ancestry, subtree, type TreeAsset } from './asset-tree.ts';
import { maintenanceMix, type MixWorkOrder } from './maintenance-mix.ts';
import { PROVENANCE_CAP } from './provenance.ts';

const HOUR_MS = 3_600_000;

/** An asset of the site as the maintenance-mix rules read it. */
export interface MixAsset extends TreeAsset {
  code: string;
  kind: AssetKind;
}

/** A historian tag of the site. */
export interface MixTag {
  id: number;
  name: string;
  assetId: number;
  quantity: Quantity;
}

/** Per tag, Σ hourly mean × the hours of that hour inside the window, and the hours of the window with a rollup. */
export interface HourlyIntegral {
  tagId: number;
  integral: number;
  hoursCovered: number;
}

/** What the maintenance-mix answer is built from: plain rows, as server/services/maintenance-mix.ts reads them. */
export interface MaintenanceMixReportInput {
  site: string;
  /** Every asset of the site. */
  assets: readonly MixAsset[];
  /** The asset asked about; null for the whole site. */
  asset: MixAsset | null;
  /** The asset asked about and every asset below it (the whole site without one). */
  inScope: readonly MixAsset[];
  /** The work orders on the assets in scope reported before the window end and not completed before its start. */
  workOrders: readonly MixWorkOrder[];
  /** The site's tags; empty when there is no train to read them for (`productionTrains`). */
  tags: readonly MixTag[];
  /** The hourly integrals of the permeate tags (`permeateTags`) over the window; empty when they were not read. */
  permeate: readonly HourlyIntegral[];
}

/**
 * The window of a maintenance-mix question: the resolved bounds (null where the site has no data to bound
 * it), `now` (the time of asking: shared/ reads no clock) and the query's option.
 */
export interface MaintenanceMixWindow {
  from: Date | null;
  to: Date | null;
  now: Date;
  cancelledPmCountsAsMissed: boolean;
}

/** The window the mix is taken over: the resolved bounds; without an end, `now`; without a start, the end (an empty window). */
export function maintenanceMixWindow(window: Pick<MaintenanceMixWindow, 'from' | 'to' | 'now'>): { from: Date; to: Date } {
  const to = window.to ?? window.now;
  return { from: window.from ?? to, to };
}

/**
 * The trains whose production a scope's maintenance is set against: the trains in scope; for an
 * asset below a train (a stage, vessel or pump), the train above it.
 */
export function productionTrains<A extends MixAsset>(scope: { assets: readonly A[]; asset: A | null; inScope: readonly A[] }): A[] {
  const inScope = scope.inScope.filter((a) => a.kind === 'train');
  if (inScope.length > 0 || scope.asset === null) return inScope;
  const above = ancestry(scope.assets, scope.asset).find((a) => a.kind === 'train');
  return above ? [above] : [];
}

/**
 * Permeate tags of each train: its own permeate_flow tags; without one, those of the stages below it
 * (stages in series each make permeate, so their flows add up). Never both, which would count twice.
 * `missing`: the trains with neither; `used`: every tag of the others.
 */
export function permeateTags<A extends MixAsset, T extends MixTag>(
  trains: readonly A[],
  assets: readonly A[],
  tags: readonly T[],
): { missing: string[]; used: T[] } {
  const flows = tags.filter((t) => t.quantity === 'permeate_flow');
  const byTrain = trains.map((train) => {
    const own = flows.filter((t) => t.assetId === train.id);
    if (own.length > 0) return { train, tags: own };
    const stageIds = new Set(subtree(assets, train).filter((a) => a.kind === 'stage').map((a) => a.id));
    return { train, tags: flows.filter((t) => stageIds.has(t.assetId)) };
  });
  return { missing: byTrain.filter((t) => t.tags.length === 0).map((t) => t.train.code), used: byTrain.flatMap((t) => t.tags) };
}

/** Permeate produced in the window, with what it was computed from. */
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
 * Permeate produced in [from, to), m³: Σ over the permeate-flow tags of the trains (`permeateTags`) of
 * hourly mean flow (m³/h, good samples only) × the hours of that hour inside the window. An hour without
 * a good sample adds nothing (said in the notes when the window is not fully covered). Null with a reason
 * when there is no train, when a train has no permeate-flow tag, or when the tags have no hourly data in
 * the window (historian not imported or `osmia refresh` not run).
 */
export function producedVolume(input: MaintenanceMixReportInput, window: { from: Date; to: Date }): ProducedVolume {
  const trains = productionTrains(input);
  const none = (reason: string): ProducedVolume => ({ producedM3: null, reason, trains: trains.map((t) => t.code), tags: [], notes: [] });
  if (trains.length === 0) return none('There is no train in this scope, so no permeate production to set the cost against.');
  const { missing, used } = permeateTags(trains, input.assets, input.tags);
  if (missing.length > 0) {
    return none(`No permeate_flow tag on train ${missing.join(', ')} or its stages, so the volume produced is not known.`);
  }
  if (input.permeate.length === 0) {
    return {
      ...none('The permeate_flow tags have no hourly data in the window (import the historian, then run osmia refresh).'),
      tags: used.map((t) => t.name),
    };
  }
  const windowHours = (window.to.getTime() - window.from.getTime()) / HOUR_MS;
  const notes: string[] = [];
  const byId = new Map(input.permeate.map((i) => [i.tagId, i]));
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
    producedM3: input.permeate.reduce((s, i) => s + i.integral, 0),
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
 * asset and everything below it (the whole site without an asset). Provenance: every work order read
 * (the first PROVENANCE_CAP, and their count), the permeate tags and trains, the window.
 * Degenerate input: every ratio with a zero or unknown denominator is null with a sentence saying why;
 * a site with no data at all gets an empty window at `now`, with a note.
 */
export function buildMaintenanceMixReport(
  input: MaintenanceMixReportInput,
  window: MaintenanceMixWindow,
  settings: Pick<Settings, 'crewHoursPerWeek' | 'currency'>,
): BeforeFreshness<MaintenanceMixReport> {
  const notes: string[] = [];
  const { from, to } = maintenanceMixWindow(window);
  if (window.from === null && window.to === null) notes.push('The site has no data yet, so the window is empty.');
  const produced = producedVolume(input, { from, to });
  const mix = maintenanceMix({
    window: { from, to },
    workOrders: input.workOrders,
    crewCapacityHoursPerWeek: settings.crewHoursPerWeek,
    producedM3: produced.producedM3,
    cancelledPmCountsAsMissed: window.cancelledPmCountsAsMissed,
  });
  const numbers = input.workOrders.map((o) => o.woNumber);
  const provenance: Provenance = {
    workOrders: numbers.slice(0, PROVENANCE_CAP),
    workOrderCount: numbers.length,
    tags: produced.tags,
    trains: produced.trains,
    windows: [{ from: from.toISOString(), to: to.toISOString(), what: 'maintenance-mix window' }],
  };
  return {
    site: input.site,
    ...(input.asset ? { asset: input.asset.code } : {}),
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
