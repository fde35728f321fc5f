// Downtime KPI (docs/design.md §6, §7): stop events of every asset in scope that has a run-status tag, planned or
// not, their cause, lost volume and cost, with totals and Pareto tables. Also home of the run-status
// history that reliability reads too: stop events from `downtime_events` turned into the edge samples the
// shared calculations take, so no request reads the raw samples table.
import type { Settings } from '#shared/schemas/settings.ts';
import type { BeforeFreshness } from '#shared/schemas/common.ts';
import { downtimeReport, type DowntimeAssetInput, type DowntimeWorkOrder } from '#shared/kpi/downtime.ts';
import type { RunStatusSample } from '#shared/kpi/operating-time.ts';
import type { WorkOrderStatus, WorkOrderType } from '#shared/schemas/enums.ts';
import type { Provenance } from '#shared/schemas/kpi.ts';
import type { DowntimeQuery, DowntimeReport } from '#shared/schemas/kpi-ops.ts';
import type { Db } from '../db/client.ts';
import type { AssetRecord } from '../db/queries/assets.ts';
import { lastStopEndsBefore, listStopsOverlapping, type StopRow } from '../db/queries/downtime-events.ts';
import { coverageExtents } from '../db/queries/sample-coverage.ts';
import { goodDataExtents } from '../db/queries/sample-hourly.ts';
import { listTags, type TagRow } from '../db/queries/tags.ts';
import { listWorkOrdersReportedOrOutOfServiceIn } from '../db/queries/work-orders.ts';
import { ancestry, resolveScope } from './scope.ts';

/** Longest list of work orders, tags or windows given as provenance; longer lists are cut and counted. */
export const PROVENANCE_CAP = 200;

/** What is known of one run-status tag over a window, in the form the shared calculations take. */
export interface RunStatusHistory {
  tag: TagRow;
  /** Edge samples inside the window, synthesized from the stop events (see `edgeSamples`). */
  samples: RunStatusSample[];
  /** Carries the state at the window start when the data began before it; null otherwise. */
  priorSample: RunStatusSample | null;
  /** First and last good run-status sample of the tag (any time, not only the window); null without good data. */
  dataFrom: Date | null;
  dataUntil: Date | null;
  /** Stop events sharing time with the window. */
  stops: StopRow[];
}

/**
 * Run-status samples equivalent to a tag's stop events, for the shared functions that take samples
 * (runStateSpans, stopSpans, operatingTimeFromRunStatus).
 *
 * `osmia refresh` has already turned the good samples into stop events [from, to) (to null: still stopped at
 * the end of the data), with docs/design.md §6's rule that a state holds until the next good sample. Inside the
 * window, every stop start becomes a 0 sample and every stop end a 1 sample; where the data starts inside
 * the window, a 1 sample marks its first instant (a stop starting at the same instant overrides it, since
 * the last sample given for an instant wins). Where the data started before the window, `priorSample`
 * carries the state at the window start: 0 at the start of the stop under way then, else 1 at the end of
 * the last earlier stop (or at the first sample). The spans the shared functions rebuild from these samples
 * are exactly the stops and the running time between them; before `dataFrom` the state stays unknown, and
 * callers cut the window at `dataUntil`, after which the state is unknown as well.
 */
export function edgeSamples(
  stops: readonly StopRow[],
  data: { from: Date; until: Date } | null,
  window: { from: Date; to: Date },
  lastStopEndBefore: Date | null,
): { samples: RunStatusSample[]; priorSample: RunStatusSample | null } {
  if (!data || data.until <= window.from || data.from >= window.to) return { samples: [], priorSample: null };
  const first: RunStatusSample[] = [];
  let priorSample: RunStatusSample | null = null;
  if (data.from < window.from) {
    const under = stops.find((s) => s.from < window.from && (s.to === null || s.to > window.from));
    const restart = lastStopEndBefore && lastStopEndBefore > data.from ? lastStopEndBefore : data.from;
    priorSample = under ? { time: under.from, value: 0 } : { time: restart, value: 1 };
  } else {
    first.push({ time: data.from, value: 1 });
  }
  const ends: RunStatusSample[] = [];
  const starts: RunStatusSample[] = [];
  for (const s of stops) {
    if (s.to !== null && s.to >= window.from && s.to < window.to) ends.push({ time: s.to, value: 1 });
    if (s.from >= window.from && s.from < window.to) starts.push({ time: s.from, value: 0 });
  }
  // Ends before starts: should a stop end where the next begins, the stopped state wins that instant.
  return { samples: [...first, ...ends, ...starts], priorSample };
}

/**
 * The run-status history of each tag over [from, to), read from the derived tables only: stop events
 * (`downtime_events`), the span each import covered (`sample_coverage`) and the good-quality hourly rollups
 * (`sample_hourly`). The data span of a tag is where both agree: from the later of its first covered
 * instant and its first good hour, to the earlier of its last covered instant and its last good sample.
 * Notes name tags without good data (rows still waiting for refresh are the answer's `warnings`: freshness.ts).
 */
export async function loadRunStatusHistories(
  db: Db,
  tags: readonly TagRow[],
  from: Date,
  to: Date,
): Promise<{ histories: Map<number, RunStatusHistory>; notes: string[] }> {
  const ids = tags.map((t) => t.id);
  const [coverage, good, stops, lastEnds] = await Promise.all([
    coverageExtents(db.$client, ids),
    goodDataExtents(db.$client, ids),
    listStopsOverlapping(db.$client, ids, from, to),
    lastStopEndsBefore(db.$client, ids, from),
  ]);
  const notes: string[] = [];
  const histories = new Map<number, RunStatusHistory>();
  for (const tag of tags) {
    const c = coverage.get(tag.id);
    const g = good.get(tag.id);
    let data: { from: Date; until: Date } | null = null;
    if (g) {
      const dataFrom = c && c.from > g.firstHour ? c.from : g.firstHour;
      const dataUntil = c && c.to < g.lastTs ? c.to : g.lastTs;
      if (dataUntil >= dataFrom) data = { from: dataFrom, until: dataUntil };
    }
    if (!data) notes.push(`${tag.name} has no good-quality run-status data.`);
    const tagStops = stops.filter((s) => s.tagId === tag.id);
    const edges = edgeSamples(tagStops, data, { from, to }, lastEnds.get(tag.id) ?? null);
    histories.set(tag.id, { tag, ...edges, dataFrom: data?.from ?? null, dataUntil: data?.until ?? null, stops: tagStops });
  }
  return { histories, notes };
}

/** The asset's rated permeate flow, or that of its nearest ancestor with one; null when none has a rating. */
export function ratedPermeate(assets: AssetRecord[], asset: AssetRecord): { m3h: number; from: string } | null {
  const rated = ancestry(assets, asset).find((a) => a.ratedPermeateM3h !== null);
  return rated ? { m3h: rated.ratedPermeateM3h!, from: rated.code } : null;
}

/** A list cut to PROVENANCE_CAP entries, with a note when it was cut. */
export function capped<T>(list: T[], what: string, notes: string[]): T[] {
  if (list.length <= PROVENANCE_CAP) return list;
  notes.push(`Provenance lists the first ${PROVENANCE_CAP} of ${list.length} ${what}.`);
  return list.slice(0, PROVENANCE_CAP);
}

type DowntimeTotal = DowntimeReport['totals'][number];

/** Downtime report with the asset whose rating gave each total's lost volume. */
export type DowntimeAnswer = Omit<BeforeFreshness<DowntimeReport>, 'totals' | 'provenance'> & {
  totals: (DowntimeTotal & { ratedPermeateFrom: string | null })[];
  provenance: Provenance;
};

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
  const rated = new Map<number, { m3h: number; from: string } | null>();
  const inputs: DowntimeAssetInput[] = [];
  for (const [assetId, tag] of runTags) {
    const asset = byId.get(assetId)!;
    const rating = ratedPermeate(assets, asset);
    rated.set(assetId, rating);
    if (rating && rating.from !== asset.code) {
      notes.push(`${asset.code} has no rated permeate flow: the ${rating.m3h} m³/h of ${rating.from} is used for its lost volume.`);
    }
    const history = histories.get(tag.id)!;
    inputs.push({
      asset: asset.code,
      ratedPermeateM3h: rating?.m3h ?? null,
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

  const codeToId = new Map(assets.map((a) => [a.code, a.id]));
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
    totals: result.totals.map((t) => ({ ...t, ratedPermeateFrom: rated.get(codeToId.get(t.asset)!)?.from ?? null })),
    plant: result.plant,
    paretoByCause: result.paretoByCause,
    paretoByAsset: result.paretoByAsset,
    notes: [...notes, ...result.notes, ...provenanceNotes],
    provenance,
  };
}
