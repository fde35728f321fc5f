// The downtime answer (docs/design.md §6 Downtime, §7 keys) from the rows its service loads
// (server/services/downtime.ts): which run-status tag stands for each asset, the run-status histories,
// the rated flow that prices each asset's lost volume, the stops (downtime.ts) and the provenance.
import type { Provenance } from '../schemas/answer.ts';
import type { BeforeFreshness } from '../schemas/common.ts';
import type { DowntimeReport } from '../schemas/downtime.ts';
import type { Quantity } from '../schemas/enums.ts';
import type { Settings } from '../schemas/settings.ts';
import { ancestry, type TreeAsset } from './asset-tree.ts';
import { downtimeReport, type DowntimeAssetInput, type DowntimeWorkOrder } from './downtime.ts';
import { capped } from './provenance.ts';
import { runStatusHistory, type RunStatusHistory, type RunStatusRows } from './run-status.ts';

/** An asset of the site as the downtime rules read it. */
export interface DowntimeAsset extends TreeAsset {
  code: string;
  parentCode: string | null;
  /** Rated permeate flow, m³/h; null when the register has none. */
  ratedPermeateM3h: number | null;
}

/** A historian tag of the site. */
export interface DowntimeTag {
  id: number;
  name: string;
  assetId: number;
  assetCode: string;
  quantity: Quantity;
}

/** What the downtime answer is built from: plain rows, as server/services/downtime.ts reads them. */
export interface DowntimeReportInput {
  site: string;
  /** Every asset of the site: the tree, and the rated flows of the assets above one without its own. */
  assets: readonly DowntimeAsset[];
  /** The asset asked about and every asset below it (the whole site without one). */
  inScope: readonly DowntimeAsset[];
  /** The site's tags, ordered by name. */
  tags: readonly DowntimeTag[];
  /** The derived rows of each tag `downtimeRunTags` picks, by tag id (server/services/run-status.ts). */
  runStatus: ReadonlyMap<number, RunStatusRows>;
  /** The work orders on the assets in scope reported in the window or out of service during it, by number. */
  workOrders: readonly DowntimeWorkOrder[];
}

/**
 * The window of a downtime question: the resolved bounds, null where the site has no data to bound it;
 * `now`, the time of asking, places the empty window of such a site (shared/ reads no clock).
 */
export interface DowntimeWindow {
  from: Date | null;
  to: Date | null;
  now: Date;
}

/**
 * One run-status tag per asset in scope that has one: the first by name (`tags` are ordered by name);
 * a note names each other run-status tag of the same asset, left unused.
 */
export function downtimeRunTags<T extends DowntimeTag>(tags: readonly T[], inScope: readonly DowntimeAsset[]): { runTags: Map<number, T>; notes: string[] } {
  const inScopeIds = new Set(inScope.map((a) => a.id));
  const runTags = new Map<number, T>();
  const notes: string[] = [];
  for (const tag of tags) {
    if (tag.quantity !== 'run_status' || !inScopeIds.has(tag.assetId)) continue;
    const kept = runTags.get(tag.assetId);
    if (kept) notes.push(`${tag.assetCode} has several run-status tags: ${kept.name} is used, ${tag.name} is not.`);
    else runTags.set(tag.assetId, tag);
  }
  return { runTags, notes };
}

/** The asset's rated permeate flow, or that of its nearest ancestor with one; null when none has a rating. */
export function ratedPermeateOf<A extends DowntimeAsset>(assets: readonly A[], asset: A): { m3h: number; from: string } | null {
  const rated = ancestry(assets, asset).find((a) => a.ratedPermeateM3h !== null);
  return rated ? { m3h: rated.ratedPermeateM3h!, from: rated.code } : null;
}

/**
 * Downtime over [from, to) for the asset asked about and everything below it (the whole site without one).
 *
 * Stop events: the stops `osmia refresh` derived from the run-status tag of each asset in scope that has one
 * (`downtimeRunTags`), cut to the window and to the end of the tag's data (`runStatusHistory`). Each is
 * planned when it overlaps the out-of-service window of a preventive or inspection work order on that
 * asset or below it; its cause is the failure code of the corrective work order (same scope) whose
 * out-of-service window overlaps it most ('unknown' with none). Lost volume = stop hours × rated permeate
 * flow, m³/h, of the asset or, without one, of its nearest ancestor with a rating (`ratedPermeateFrom` says
 * which); cost = lost volume × the water value setting (currency per m³). Cancelled orders are left out.
 * Provenance: the run-status tags, the window, each tag's data span, and the work orders that planned a
 * stop or gave its cause with their out-of-service windows (cut to PROVENANCE_CAP).
 * Source: docs/design.md §6 (downtime), §7 (keys); the calculation is `downtimeReport` (downtime.ts).
 *
 * Degenerate input: no asset with a run-status tag in scope → no events, no totals, a note; no window
 * (a site with no data at all) → an empty window [t, t) at its one bound or at `now`, with a note.
 */
export function buildDowntimeReport(
  input: DowntimeReportInput,
  window: DowntimeWindow,
  settings: Pick<Settings, 'currency' | 'waterValuePerM3'>,
): BeforeFreshness<DowntimeReport> {
  const base = { site: input.site, currency: settings.currency, waterValuePerM3: settings.waterValuePerM3 };
  if (!window.from || !window.to) {
    const at = (window.from ?? window.to ?? window.now).toISOString();
    return {
      ...base,
      from: at,
      to: at,
      events: [],
      totals: [],
      plant: { events: 0, hours: 0, plannedHours: 0, unplannedHours: 0, lostVolumeM3: 0, cost: 0 },
      paretoByCause: [],
      paretoByAsset: [],
      notes: [`Site ${input.site} has no data to bound a window: give from and to, or import data first.`],
      provenance: { workOrders: [], tags: [], windows: [] },
    };
  }
  const from = window.from;
  const to = window.to;
  const byId = new Map(input.assets.map((a) => [a.id, a]));

  const { runTags, notes } = downtimeRunTags(input.tags, input.inScope);
  if (runTags.size === 0) notes.push('No asset in scope has a run-status tag: there are no stop events to count.');
  const histories = new Map<number, RunStatusHistory>();
  for (const tag of runTags.values()) {
    const rows = input.runStatus.get(tag.id);
    if (!rows) throw new RangeError(`runStatus has no rows for tag ${tag.name}`);
    const { history, note } = runStatusHistory(tag.name, rows, { from, to });
    if (note) notes.push(note);
    histories.set(tag.id, history);
  }
  const assets: DowntimeAssetInput[] = [];
  for (const [assetId, tag] of runTags) {
    const asset = byId.get(assetId)!;
    const rating = ratedPermeateOf(input.assets, asset);
    if (rating && rating.from !== asset.code) {
      notes.push(`${asset.code} has no rated permeate flow: the ${rating.m3h} m³/h of ${rating.from} is used for its lost volume.`);
    }
    const history = histories.get(tag.id)!;
    assets.push({
      asset: asset.code,
      ratedPermeateM3h: rating?.m3h ?? null,
      ratedPermeateFrom: rating?.from ?? null,
      runStatusTag: tag.name,
      samples: history.samples,
      priorSample: history.priorSample,
      dataUntil: history.dataUntil,
    });
  }

  const result = downtimeReport({
    window: { from, to },
    assets,
    assetTree: input.assets.map((a) => ({ code: a.code, parent: a.parentCode })),
    workOrders: input.workOrders,
    settings: { waterValuePerM3: settings.waterValuePerM3 },
  });

  const used = new Set(result.events.flatMap((e) => [...e.plannedBy, ...(e.causeWorkOrder ? [e.causeWorkOrder] : [])]));
  const usedOrders = input.workOrders.filter((wo) => used.has(wo.woNumber));
  const provenanceNotes: string[] = [];
  const windows: Provenance['windows'] = [{ from: from.toISOString(), to: to.toISOString(), what: 'window' }];
  for (const tag of runTags.values()) {
    const h = histories.get(tag.id)!;
    if (h.dataFrom && h.dataUntil) {
      windows.push({ from: h.dataFrom.toISOString(), to: h.dataUntil.toISOString(), what: `run-status data of ${tag.name}` });
    }
  }
  for (const wo of usedOrders) {
    windows.push({ from: wo.outOfServiceFrom!.toISOString(), to: wo.outOfServiceTo!.toISOString(), what: `out of service ${wo.woNumber}` });
  }
  const provenance: Provenance = {
    workOrders: capped(
      usedOrders.map((wo) => wo.woNumber),
      'work orders',
      provenanceNotes,
    ),
    tags: [...runTags.values()].map((t) => t.name),
    windows: capped(windows, 'windows', provenanceNotes),
  };
  return {
    ...base,
    from: result.from,
    to: result.to,
    events: result.events,
    totals: result.totals,
    plant: result.plant,
    paretoByCause: result.paretoByCause,
    paretoByAsset: result.paretoByAsset,
    notes: [...notes, ...result.notes, ...provenanceNotes],
    provenance,
  };
}
