// Downtime KPI (docs/design.md §6, §7): stop events of every asset in scope that has a run-status tag, planned or
// not, their cause, lost volume and cost, with totals and Pareto tables. The run-status history it starts
// from (shared with reliability) is read in run-status.ts.
import type { Settings } from '#shared/schemas/settings.ts';
import type { BeforeFreshness } from '#shared/schemas/common.ts';
import { downtimeReport, type DowntimeAssetInput, type DowntimeWorkOrder } from '#shared/kpi/downtime.ts';
import type { WorkOrderStatus, WorkOrderType } from '#shared/schemas/enums.ts';
import type { Provenance } from '#shared/schemas/answer.ts';
import type { DowntimeQuery, DowntimeReport } from '#shared/schemas/downtime.ts';
import type { Db } from '../db/client.ts';
import { listTags, type TagRow } from '../db/queries/tags.ts';
import { listWorkOrdersReportedOrOutOfServiceIn } from '../db/queries/work-orders.ts';
import { capped } from './provenance.ts';
import { loadRunStatusHistories, ratedPermeate } from './run-status.ts';
import { resolveScope } from './scope.ts';

/** The downtime answer as the service computes it: exactly the schema's type, before freshness. */
export type DowntimeAnswer = BeforeFreshness<DowntimeReport>;


/**
 * Downtime over [from, to) for the asset asked about and everything below it (the whole site without one).
 *
 * Stop events: the stops `osmia refresh` derived from the run-status tag of each asset in scope that has one
 * (the first by name when an asset has several), cut to the window and to the end of the tag's data. Each
 * is planned when it overlaps the out-of-service window of a preventive or inspection work order on that
 * asset or below it; its cause is the failure code of the corrective work order (same scope) whose
 * out-of-service window overlaps it most ('unknown' with none). Lost volume = stop hours × rated permeate
 * flow, m³/h, of the asset or, without one, of its nearest ancestor with a rating (`ratedPermeateFrom` says
 * which); cost = lost volume × the water value setting (currency per m³). Cancelled orders are left out.
 * Source: docs/design.md §6 (downtime), §7 (keys); calculation in shared/kpi/downtime.ts.
 *
 * Degenerate input: no asset with a run-status tag in scope → no events, no totals, a note; a site with no
 * data at all → an empty window [t, t) at the time of asking, with a note.
 */
export async function getDowntime(db: Db, query: DowntimeQuery, settings: Settings): Promise<DowntimeAnswer> {
  const scope = await resolveScope(db, query);
  const { site, assets, inScope } = scope;
  const base = { site: site.code, currency: settings.currency, waterValuePerM3: settings.waterValuePerM3 };
  if (!scope.from || !scope.to) {
    const at = (scope.from ?? scope.to ?? new Date()).toISOString();
    return {
      ...base,
      from: at,
      to: at,
      events: [],
      totals: [],
      plant: { events: 0, hours: 0, plannedHours: 0, unplannedHours: 0, lostVolumeM3: 0, cost: 0 },
      paretoByCause: [],
      paretoByAsset: [],
      notes: [`Site ${site.code} has no data to bound a window: give from and to, or import data first.`],
      provenance: { workOrders: [], tags: [], windows: [] },
    };
  }
  const from = scope.from;
  const to = scope.to;
  const notes: string[] = [];
  const inScopeIds = new Set(inScope.map((a) => a.id));
  const byId = new Map(assets.map((a) => [a.id, a]));

  // One run-status tag per asset: the first by name (listTags orders by name).
  const runTags = new Map<number, TagRow>();
  for (const tag of await listTags(db.$client, site.id)) {
    if (tag.quantity !== 'run_status' || !inScopeIds.has(tag.assetId)) continue;
    const kept = runTags.get(tag.assetId);
    if (kept) notes.push(`${tag.assetCode} has several run-status tags: ${kept.name} is used, ${tag.name} is not.`);
    else runTags.set(tag.assetId, tag);
  }
  if (runTags.size === 0) notes.push('No asset in scope has a run-status tag: there are no stop events to count.');

  const { histories, notes: historyNotes } = await loadRunStatusHistories(db, [...runTags.values()], from, to);
  notes.push(...historyNotes);
  const inputs: DowntimeAssetInput[] = [];
  for (const [assetId, tag] of runTags) {
    const asset = byId.get(assetId)!;
    const rating = ratedPermeate(assets, asset);
    if (rating && rating.from !== asset.code) {
      notes.push(`${asset.code} has no rated permeate flow: the ${rating.m3h} m³/h of ${rating.from} is used for its lost volume.`);
    }
    const history = histories.get(tag.id)!;
    inputs.push({
      asset: asset.code,
      ratedPermeateM3h: rating?.m3h ?? null,
      ratedPermeateFrom: rating?.from ?? null,
      runStatusTag: tag.name,
      samples: history.samples,
      priorSample: history.priorSample,
      dataUntil: history.dataUntil,
    });
  }

  const orders = await listWorkOrdersReportedOrOutOfServiceIn(db.$client, site.id, [...inScopeIds], from, to);
  const workOrders: DowntimeWorkOrder[] = orders.map((wo) => ({
    woNumber: wo.woNumber,
    asset: byId.get(wo.assetId)!.code,
    type: wo.type as WorkOrderType,
    status: wo.status as WorkOrderStatus,
    failureCode: wo.failureCode,
    outOfServiceFrom: wo.outOfServiceFrom,
    outOfServiceTo: wo.outOfServiceTo,
  }));
  const result = downtimeReport({
    window: { from, to },
    assets: inputs,
    assetTree: assets.map((a) => ({ code: a.code, parent: a.parentCode })),
    workOrders,
    settings: { waterValuePerM3: settings.waterValuePerM3 },
  });

  const used = new Set(result.events.flatMap((e) => [...e.plannedBy, ...(e.causeWorkOrder ? [e.causeWorkOrder] : [])]));
  const usedOrders = orders.filter((wo) => used.has(wo.woNumber));
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
