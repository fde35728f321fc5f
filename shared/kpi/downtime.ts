// Downtime events, their classification and cause, lost production and Pareto tables (docs/design.md §6, §7).
//
// A stop event runs from a running→stopped edge of an asset's run-status tag to the next
// stopped→running edge. Planned when it overlaps the out-of-service window of a preventive or
// inspection work order on the asset or one below it; cause = failure code of the corrective work order
// (same scope) whose out-of-service window overlaps it most. Everything is in UTC instants.

import type { DowntimeEvent, DowntimePlantTotal, DowntimeReport, DowntimeTotal, ParetoRow } from '#shared/schemas/downtime.ts';
import type { WorkOrderStatus, WorkOrderType } from '#shared/schemas/enums.ts';
import {
  hoursBetween,
  instantError,
  instantMs,
  validMs,
  mergeIntervals,
  runStateSpans,
  windowMs,
  overlapMs,
  type MsInterval,
  type RunStatusSample,
  type TimeWindow,
} from './operating-time.ts';
import type { WorkOrderRecord } from './work-orders.ts';

/** An asset with a run-status tag whose stops are counted. */
export interface DowntimeAssetInput {
  /** Asset code. */
  asset: string;
  /** Rated permeate flow in m³/h; null when the register has none (lost volume is then null). */
  ratedPermeateM3h: number | null;
  /** The asset whose rating that is: this one, or the nearest above it with one; null without a rating. */
  ratedPermeateFrom?: string | null;
  runStatusTag: string;
  /** Good-quality run-status samples (1 running, 0 stopped). */
  samples: readonly RunStatusSample[];
  /** The last good sample before the window, if any: it gives the state at the window start. */
  priorSample?: RunStatusSample | null;
  /**
   * Where the asset's run-status data ends (its last good sample), when that is before the window end: a stop
   * still open there is cut at it (`clippedAtEnd`) instead of being carried to the window end, since the state
   * after the last sample is not known. Default: the window end.
   */
  dataUntil?: Date | null;
}

/** One node of the asset tree (for "the asset or one below it"). */
export interface AssetNode {
  code: string;
  parent: string | null;
}

/** What the downtime rules read of a work order. */
export type DowntimeWorkOrder = Pick<WorkOrderRecord, 'woNumber' | 'asset' | 'type' | 'status' | 'failureCode' | 'outOfServiceFrom' | 'outOfServiceTo'>;

export interface DowntimeSettings {
  /** Value of one m³ of permeate, in the plant's currency; null when not set (cost is then null). */
  waterValuePerM3: number | null;
}

export interface DowntimeInput {
  window: TimeWindow;
  assets: readonly DowntimeAssetInput[];
  assetTree: readonly AssetNode[];
  workOrders: readonly DowntimeWorkOrder[];
  settings: DowntimeSettings;
}

/** A stop span in milliseconds, with the flags saying where it was cut by the window or by missing data. */
export interface StopSpan extends MsInterval {
  /** The stop began before `fromMs`: at or before the window start, or before the first good sample. */
  clippedAtStart: boolean;
  /** The stop was still open at the window end and is cut there. */
  clippedAtEnd: boolean;
}

// The answer's parts are the types of its schema (shared/schemas/downtime.ts), not interfaces beside it.
export type { DowntimeEvent, DowntimePlantTotal, DowntimeTotal, ParetoRow };

/** The calculated part of the answer (shared/schemas/downtime.ts); `buildDowntimeReport` adds site, currency and provenance. */
export type DowntimeResult = Pick<DowntimeReport, 'from' | 'to' | 'events' | 'totals' | 'plant' | 'paretoByCause' | 'paretoByAsset' | 'waterValuePerM3' | 'notes'>;

export const UNKNOWN_CAUSE = 'unknown';

/**
 * Stop spans from run-status edges inside [from, to): each runs from a running→stopped change to the next
 * stopped→running change. A stop still open at the window end is cut there (`clippedAtEnd`); a stop already
 * under way at the window start (state known from `priorSample`), or whose start is hidden because the first
 * good sample reads stopped, begins at the window start or that sample (`clippedAtStart`). Units: epoch ms.
 * Degenerate input: no samples, or running throughout → []; stopped throughout → one span over the window.
 */
export function stopSpans(
  samples: readonly RunStatusSample[],
  window: TimeWindow,
  priorSample?: RunStatusSample | null,
): StopSpan[] {
  const w = windowMs(window);
  const { spans, stateBeforeWindow } = runStateSpans(samples, window, priorSample);
  const stops: StopSpan[] = [];
  spans.forEach((span, i) => {
    if (span.state !== 'stopped') return;
    // The state just before this span: the previous span's, or for a span opening the window the state
    // carried in from before it (running there means a running→stopped edge exactly at the window start).
    const previous = i > 0 ? spans[i - 1]!.state : stateBeforeWindow;
    stops.push({
      fromMs: span.fromMs,
      toMs: span.toMs,
      clippedAtStart: previous !== 'running',
      clippedAtEnd: span.toMs === w.toMs,
    });
  });
  return stops;
}

/**
 * The codes of an asset and every asset below it in the tree. Source: docs/design.md §6 (an asset's failures include
 * those of the assets below it). An asset missing from the tree is its own, only, scope. A cycle is an error.
 */
export function assetScope(tree: readonly AssetNode[], code: string): Set<string> {
  const children = new Map<string, string[]>();
  for (const node of tree) {
    if (node.parent === null) continue;
    const list = children.get(node.parent) ?? [];
    list.push(node.code);
    children.set(node.parent, list);
  }
  const scope = new Set<string>([code]);
  const stack = [code];
  while (stack.length > 0) {
    const current = stack.pop()!;
    for (const child of children.get(current) ?? []) {
      if (child === code || scope.has(child)) {
        throw new RangeError(`asset tree has a cycle through ${child}`);
      }
      scope.add(child);
      stack.push(child);
    }
  }
  return scope;
}

function checkWorkOrders(workOrders: readonly DowntimeWorkOrder[]): CheckedWorkOrderLike[] {
  // Only the fields the rules read, built field by field, and an order named only in an error: this runs
  // over every order of the scope (tens of thousands on a large site).
  const what = (i: number) => `workOrders[${i}] (${workOrders[i]!.woNumber})`;
  return workOrders.map((wo, i) => {
    let oos: MsInterval | null = null;
    if (wo.outOfServiceFrom === null || wo.outOfServiceTo === null) {
      if (wo.outOfServiceFrom !== wo.outOfServiceTo) {
        throw new RangeError(`${what(i)}: out-of-service from and to must both be set or both be empty`);
      }
    } else {
      const fromMs = validMs(wo.outOfServiceFrom);
      if (Number.isNaN(fromMs)) throw instantError(wo.outOfServiceFrom, `${what(i)}.outOfServiceFrom`);
      const toMs = validMs(wo.outOfServiceTo);
      if (Number.isNaN(toMs)) throw instantError(wo.outOfServiceTo, `${what(i)}.outOfServiceTo`);
      if (toMs < fromMs) throw new RangeError(`${what(i)}: out-of-service window ends before it starts`);
      oos = { fromMs, toMs };
    }
    return { woNumber: wo.woNumber, asset: wo.asset, type: wo.type, status: wo.status, failureCode: wo.failureCode, oos };
  });
}

/**
 * Classifies one stop. Planned: some non-cancelled preventive or inspection work order in `scope` has an
 * out-of-service window sharing positive time with the stop. Cause: among non-cancelled corrective work
 * orders in `scope`, the one whose out-of-service window shares the most time with the stop (ties: earlier
 * window start, then lower work-order number); its failure code, or 'unknown' when it has none or no
 * corrective work order overlaps. Source: docs/design.md §6 (downtime). Cancelled work orders are left out: their
 * windows are plans that did not happen.
 */
export function classifyStop(
  stop: MsInterval,
  scope: ReadonlySet<string>,
  workOrders: readonly CheckedWorkOrderLike[],
): { planned: boolean; plannedBy: string[]; cause: string; causeWorkOrder: string | null; causeOverlapHours: number } {
  const relevant = workOrders.filter((wo) => wo.oos !== null && wo.status !== 'cancelled' && scope.has(wo.asset));
  const plannedBy = relevant
    .filter((wo) => (wo.type === 'preventive' || wo.type === 'inspection') && overlapMs(stop, wo.oos!) > 0)
    .map((wo) => wo.woNumber);
  let best: CheckedWorkOrderLike | null = null;
  let bestOverlap = 0;
  for (const wo of relevant) {
    if (wo.type !== 'corrective') continue;
    const overlap = overlapMs(stop, wo.oos!);
    if (overlap <= 0) continue;
    const better =
      best === null ||
      overlap > bestOverlap ||
      (overlap === bestOverlap &&
        (wo.oos!.fromMs < best.oos!.fromMs || (wo.oos!.fromMs === best.oos!.fromMs && wo.woNumber < best.woNumber)));
    if (better) {
      best = wo;
      bestOverlap = overlap;
    }
  }
  const code = best?.failureCode?.trim();
  return {
    planned: plannedBy.length > 0,
    plannedBy,
    cause: code ? code : UNKNOWN_CAUSE,
    causeWorkOrder: best?.woNumber ?? null,
    causeOverlapHours: hoursBetween(0, bestOverlap),
  };
}

/** The fields `classifyStop` reads: a work order with its out-of-service window in milliseconds. */
export interface CheckedWorkOrderLike {
  woNumber: string;
  asset: string;
  type: WorkOrderType;
  status: WorkOrderStatus;
  failureCode: string | null;
  oos: MsInterval | null;
}

function checkNonNegative(value: number | null, what: string): void {
  if (value === null) return;
  if (!Number.isFinite(value) || value < 0) throw new RangeError(`${what} must be a finite number ≥ 0, got ${value}`);
}

/**
 * Pareto table: stop hours grouped by `key`, sorted by hours descending (ties by key), with each group's
 * share of all stop hours and the cumulative share down the table. Lost volume and cost of a group are
 * null when any of its events has them null. Source: Pareto analysis, common practice. Degenerate input:
 * no events, or events of zero length only → [].
 */
export function paretoTable(events: readonly DowntimeEvent[], keyOf: (e: DowntimeEvent) => string): ParetoRow[] {
  const groups = new Map<string, DowntimeEvent[]>();
  for (const e of events) {
    const key = keyOf(e);
    const list = groups.get(key) ?? [];
    list.push(e);
    groups.set(key, list);
  }
  // Shares come from whole milliseconds, not from summed fractional hours: the running sum of the
  // last row is then exactly the total, so the cumulative share ends at exactly 1, never 1.0000000000000004.
  const msOf = (e: DowntimeEvent) => Date.parse(e.to) - Date.parse(e.from);
  const totalMs = events.reduce((acc, e) => acc + msOf(e), 0);
  if (totalMs <= 0) return [];
  const rows = [...groups.entries()].map(([key, list]) => ({
    key,
    ms: list.reduce((acc, e) => acc + msOf(e), 0),
    ...sumEvents(list),
  }));
  rows.sort((a, b) => b.ms - a.ms || (a.key < b.key ? -1 : a.key > b.key ? 1 : 0));
  let runningMs = 0;
  return rows.map(({ ms, ...row }) => {
    runningMs += ms;
    return { ...row, share: ms / totalMs, cumulativeShare: runningMs / totalMs };
  });
}

/**
 * The parts of `spans` outside every interval of `cover` (merged, sorted), each flagged with whether it
 * keeps the span's own start and end. Used to take out of an asset's stops the time an asset above it
 * was stopped too.
 */
export function spansOutside(spans: readonly StopSpan[], cover: readonly MsInterval[]): StopSpan[] {
  const out: StopSpan[] = [];
  for (const span of spans) {
    let at = span.fromMs;
    for (const c of cover) {
      if (c.toMs <= at || c.fromMs >= span.toMs) continue;
      if (c.fromMs > at) out.push({ fromMs: at, toMs: c.fromMs, clippedAtStart: at === span.fromMs && span.clippedAtStart, clippedAtEnd: false });
      at = Math.max(at, c.toMs);
      if (at >= span.toMs) break;
    }
    if (at < span.toMs) out.push({ fromMs: at, toMs: span.toMs, clippedAtStart: at === span.fromMs && span.clippedAtStart, clippedAtEnd: span.clippedAtEnd });
  }
  return out;
}

/** The window cut at `dataUntil` when that falls inside it (never before the window start). */
function windowUntil(window: TimeWindow, dataUntil: Date | null): TimeWindow {
  if (dataUntil === null) return window;
  const untilMs = instantMs(dataUntil, 'dataUntil');
  if (untilMs >= window.to.getTime()) return window;
  return { from: window.from, to: new Date(Math.max(untilMs, window.from.getTime())) };
}

function sum(values: readonly number[]): number {
  return values.reduce((acc, v) => acc + v, 0);
}

function sumOrNull(values: readonly (number | null)[]): number | null {
  let acc = 0;
  for (const v of values) {
    if (v === null) return null;
    acc += v;
  }
  return acc;
}

/**
 * Downtime report over [from, to): stop events of each asset with a run-status tag, each classified
 * planned/unplanned and given a cause; lost volume = stop hours × rated permeate flow (m³/h → m³);
 * cost = lost volume × water value per m³; totals per asset; Pareto by cause and by asset.
 *
 * Source: docs/design.md §6 (downtime) and §7 (`kpi downtime --json` keys). Stops are real elapsed time (UTC).
 * Degenerate input: no assets → no events, no totals; an asset without samples → a zero totals row and a
 * note; no rated flow → lost volume and cost null (noted); no water value → cost null (noted). An asset whose
 * `dataUntil` falls inside the window has its stops cut there (noted): the state after its last sample is unknown.
 */
export function downtimeReport(input: DowntimeInput): DowntimeResult {
  windowMs(input.window);
  const { waterValuePerM3 } = input.settings;
  checkNonNegative(waterValuePerM3, 'settings.waterValuePerM3');
  const workOrders = checkWorkOrders(input.workOrders);
  const notes: string[] = [];
  if (waterValuePerM3 === null) notes.push('No water value per m³ is set: costs are null.');

  // Pass 1: every asset's stops as its own run-status tag reads them.
  const seen = new Set<string>();
  const raw = new Map<string, StopSpan[]>();
  for (const asset of input.assets) {
    if (seen.has(asset.asset)) throw new RangeError(`asset ${asset.asset} is listed twice`);
    seen.add(asset.asset);
    checkNonNegative(asset.ratedPermeateM3h, `rated permeate flow of ${asset.asset}`);
    if (asset.ratedPermeateM3h === null) {
      notes.push(`${asset.asset} has no rated permeate flow: its lost volume and cost are null.`);
    }
    if (asset.samples.length === 0 && !asset.priorSample) {
      notes.push(`${asset.asset} (${asset.runStatusTag}) has no good run-status sample in the window: no stops counted.`);
    }
    const assetWindow = windowUntil(input.window, asset.dataUntil ?? null);
    if (assetWindow.to < input.window.to) {
      notes.push(`${asset.asset} (${asset.runStatusTag}) has run-status data only until ${assetWindow.to.toISOString()}: stops are cut there.`);
    }
    raw.set(asset.asset, stopSpans(asset.samples, assetWindow, asset.priorSample));
  }

  // Pass 2: an asset's own stops are the time it was stopped while no asset above it (with a run-status
  // tag of its own) was: a pump that stops with its train is part of the train's stop, counted once there.
  const above = ancestorsWithStops(input.assetTree, raw);
  const events: DowntimeEvent[] = [];
  const totals: DowntimeTotal[] = [];
  let absorbed = 0;
  for (const asset of input.assets) {
    const own = raw.get(asset.asset)!;
    const cover = mergeIntervals((above.get(asset.asset) ?? []).flatMap((code) => raw.get(code)!));
    const pieces = cover.length > 0 ? spansOutside(own, cover) : own;
    if (pieces.length !== own.length || pieces.some((p, i) => p.fromMs !== own[i]!.fromMs || p.toMs !== own[i]!.toMs)) absorbed++;
    const scope = assetScope(input.assetTree, asset.asset);
    const below = [...raw.keys()].filter((code) => code !== asset.asset && above.get(code)?.includes(asset.asset));
    // The work orders that can touch this asset's stops, found once rather than for every stop.
    const candidates = workOrders.filter((wo) => wo.oos !== null && wo.status !== 'cancelled' && scope.has(wo.asset) && wo.oos.toMs > input.window.from.getTime());
    const assetEvents: DowntimeEvent[] = [];
    for (const stop of pieces) {
      const hours = hoursBetween(stop.fromMs, stop.toMs);
      const c = classifyStop(stop, scope, candidates);
      const lostVolumeM3 = asset.ratedPermeateM3h === null ? null : hours * asset.ratedPermeateM3h;
      assetEvents.push({
        asset: asset.asset,
        from: new Date(stop.fromMs).toISOString(),
        to: new Date(stop.toMs).toISOString(),
        hours,
        planned: c.planned,
        cause: c.cause,
        lostVolumeM3,
        cost: lostVolumeM3 === null || waterValuePerM3 === null ? null : lostVolumeM3 * waterValuePerM3,
        tag: asset.runStatusTag,
        clippedAtStart: stop.clippedAtStart,
        clippedAtEnd: stop.clippedAtEnd,
        plannedBy: c.plannedBy,
        causeWorkOrder: c.causeWorkOrder,
        causeOverlapHours: c.causeOverlapHours,
        alsoStopped: below.filter((code) => overlapsAny(raw.get(code)!, stop)),
      });
    }
    totals.push({
      asset: asset.asset,
      ...sumEvents(assetEvents),
      tag: asset.runStatusTag,
      ratedPermeateM3h: asset.ratedPermeateM3h,
      ratedPermeateFrom: asset.ratedPermeateM3h === null ? null : (asset.ratedPermeateFrom ?? asset.asset),
    });
    events.push(...assetEvents);
  }
  if (absorbed > 0) {
    notes.push(
      `Stops of ${absorbed === 1 ? 'one asset' : `${absorbed} assets`} that stopped while an asset above them was stopped too are counted once, in that asset's event (alsoStopped).`,
    );
  }
  if (events.some((e) => e.clippedAtEnd)) {
    notes.push('Some stops were still open at the window end: they are cut there (clippedAtEnd).');
  }
  events.sort((a, b) => (a.from < b.from ? -1 : a.from > b.from ? 1 : a.asset < b.asset ? -1 : a.asset > b.asset ? 1 : 0));
  return {
    from: input.window.from.toISOString(),
    to: input.window.to.toISOString(),
    events,
    totals,
    plant: sumEvents(events),
    paretoByCause: paretoTable(events, (e) => e.cause),
    paretoByAsset: paretoTable(events, (e) => e.asset),
    waterValuePerM3,
    notes,
  };
}

/** Count, hours (planned and not), lost volume and cost of some events; volume and cost null when any event's is. */
function sumEvents(events: readonly DowntimeEvent[]): DowntimePlantTotal {
  return {
    events: events.length,
    hours: sum(events.map((e) => e.hours)),
    plannedHours: sum(events.filter((e) => e.planned).map((e) => e.hours)),
    unplannedHours: sum(events.filter((e) => !e.planned).map((e) => e.hours)),
    lostVolumeM3: sumOrNull(events.map((e) => e.lostVolumeM3)),
    cost: sumOrNull(events.map((e) => e.cost)),
  };
}

/**
 * For each asset with stops, the assets above it in the tree that have stops of their own (run-status
 * tags), nearest first. A cycle in the tree is an error (as in `assetScope`).
 */
function ancestorsWithStops(tree: readonly AssetNode[], withStops: ReadonlyMap<string, unknown>): Map<string, string[]> {
  const parentOf = new Map(tree.map((n) => [n.code, n.parent]));
  const out = new Map<string, string[]>();
  for (const code of withStops.keys()) {
    const line: string[] = [];
    const visited = new Set([code]);
    for (let at = parentOf.get(code) ?? null; at !== null; at = parentOf.get(at) ?? null) {
      if (visited.has(at)) throw new RangeError(`asset tree has a cycle through ${at}`);
      visited.add(at);
      if (withStops.has(at)) line.push(at);
    }
    out.set(code, line);
  }
  return out;
}

/** Whether any of the time-sorted, non-overlapping `spans` shares time with `interval` (binary search). */
function overlapsAny(spans: readonly MsInterval[], interval: MsInterval): boolean {
  let lo = 0;
  let hi = spans.length;
  while (lo < hi) {
    const mid = (lo + hi) >> 1;
    if (spans[mid]!.toMs <= interval.fromMs) lo = mid + 1;
    else hi = mid;
  }
  return lo < spans.length && spans[lo]!.fromMs < interval.toMs;
}
