// The reliability answer (docs/design.md §6, §7) from plain rows: which work orders are failures, which
// tag or calendar gives each asset's operating time, the figures of the asset (or site) and of each group,
// the notes and the provenance. server/services/reliability.ts reads the rows; the maths is in
// reliability.ts and operating-time.ts.
import type { Provenance } from '#shared/schemas/answer.ts';
import type { BeforeFreshness } from '#shared/schemas/common.ts';
import type { AssetKind, Quantity } from '#shared/schemas/enums.ts';
import type { ReliabilityQuery, ReliabilityReport } from '#shared/schemas/reliability.ts';
import { agree, countOf } from '#shared/text.ts';
import { ancestry, subtree, type TreeAsset } from './asset-tree.ts';
import {
  operatingTimeFromCalendar,
  operatingTimeFromRunStatus,
  type OperatingTimeSource,
  type OutOfServiceWindow,
} from './operating-time.ts';
import { capped } from './provenance.ts';
import type { RunStatusHistory } from './run-status.ts';
import {
  inherentAvailability,
  meanActiveRepairHours,
  mtbfWithBounds,
  mttrHours,
  operationalAvailability,
} from './reliability.ts';
import { nullBecause, type NullReason, type Ratio } from './stats.ts';
import { isFailure } from './work-orders.ts';

const MS_PER_HOUR = 3_600_000;

/** An asset of the site (server/db/queries/assets.ts rows fit it). */
export interface ReliabilityAsset extends TreeAsset {
  code: string;
  kind: AssetKind;
}

/** A historian tag of the site; only run-status tags give operating time. */
export interface ReliabilityTag {
  id: number;
  name: string;
  assetId: number;
  assetCode: string;
  quantity: Quantity;
}

/** A work order, as far as reliability reads it. */
export interface ReliabilityWorkOrder {
  woNumber: string;
  assetId: number;
  type: string;
  status: string;
  failureCode: string | null;
  reportedAt: Date;
  startedAt: Date | null;
  completedAt: Date | null;
  outOfServiceFrom: Date | null;
  outOfServiceTo: Date | null;
}

/** What is known of one run-status tag over the window (shared/kpi/run-status.ts's history, read by server/services/run-status.ts), with the tag it is of. */
export type RunStatusHistoryInput = Pick<RunStatusHistory, 'samples' | 'priorSample' | 'dataFrom' | 'dataUntil'> & { tag: { id: number; name: string } };

/** Everything a reliability answer is computed from, as plain rows. */
export interface ReliabilityReportInput {
  /** Site code. */
  site: string;
  /** Every asset of the site. */
  assets: readonly ReliabilityAsset[];
  /** The asset asked about; null for the whole site. */
  asset: ReliabilityAsset | null;
  /** The asset and every asset below it (every asset of the site without one). */
  inScope: readonly ReliabilityAsset[];
  /** The site's tags, by name. Empty without a window. */
  tags: readonly ReliabilityTag[];
  /** Work orders on assets in scope reported in the window or out of service during it. Empty without a window. */
  workOrders: readonly ReliabilityWorkOrder[];
  /** By tag id: the history of each tag `operatingTimeTags` names. */
  histories: ReadonlyMap<number, RunStatusHistoryInput>;
  /** What reading the histories found to say (tags without good data). */
  historyNotes: readonly string[];
}

/** The resolved window [from, to) (null bounds: the site has no data) and the query's options. */
export type ReliabilityWindow = { from: Date | null; to: Date | null } & Pick<ReliabilityQuery, 'confidence' | 'groupBy'>;

export type ReliabilityAnswer = BeforeFreshness<ReliabilityReport>;
type Figures = Omit<ReliabilityReport['groups'][number], 'key'>;
type MttrBasis = ReliabilityReport['mttrBasis'];

/** Operating time of one asset (a "unit"), as it enters a sum. */
type UnitTime = ReliabilityReport['operatingTime']['units'][number] & {
  uptimeHours: number;
  downtimeHours: number;
  unknownHours: number;
  windowHours: number;
  notes: string[];
};

/** Run-status tags by asset: the first by name when an asset has several (noted). */
function runStatusTagsByAsset<T extends ReliabilityTag>(tags: readonly T[]): { runTagOf: Map<number, T>; notes: string[] } {
  const runTagOf = new Map<number, T>();
  const notes: string[] = [];
  for (const tag of tags) {
    if (tag.quantity !== 'run_status') continue;
    if (runTagOf.has(tag.assetId)) notes.push(`${tag.assetCode} has several run-status tags: ${runTagOf.get(tag.assetId)!.name} is used, ${tag.name} is not.`);
    else runTagOf.set(tag.assetId, tag);
  }
  return { runTagOf, notes };
}

/** Which tag gives an asset's operating time: its own, else the nearest ancestor's (docs/design.md §6 Operating time T). */
function operatingTagOf<T extends ReliabilityTag>(
  assets: readonly ReliabilityAsset[],
  runTagOf: ReadonlyMap<number, T>,
  a: ReliabilityAsset,
): { tag: T; source: OperatingTimeSource } | null {
  for (const [i, at] of ancestry(assets, a).entries()) {
    const tag = runTagOf.get(at.id);
    if (tag) return { tag, source: i === 0 ? 'run-status' : 'ancestor-run-status' };
  }
  return null;
}

/**
 * The run-status tags whose histories a reliability answer reads: for each asset in scope, its own
 * run-status tag or its nearest ancestor's (the first by name where an asset has several), each once,
 * in the order of the assets in scope.
 */
export function operatingTimeTags<T extends ReliabilityTag>(assets: readonly ReliabilityAsset[], inScope: readonly ReliabilityAsset[], tags: readonly T[]): T[] {
  const { runTagOf } = runStatusTagsByAsset(tags);
  const needed = new Map<number, T>();
  for (const a of inScope) {
    const t = operatingTagOf(assets, runTagOf, a);
    if (t) needed.set(t.tag.id, t.tag);
  }
  return [...needed.values()];
}

/** Weakest source of a sum: any calendar time makes it 'calendar-less-out-of-service', then ancestor, then own tag. */
function weakestSource(units: readonly UnitTime[]): OperatingTimeSource {
  const order: OperatingTimeSource[] = ['calendar-less-out-of-service', 'ancestor-run-status', 'run-status'];
  return order.find((s) => units.some((u) => u.source === s)) ?? 'calendar-less-out-of-service';
}

const hoursOf = (from: Date, to: Date) => (to.getTime() - from.getTime()) / MS_PER_HOUR;

function ratioOf(value: number | null, reason: NullReason | undefined): Ratio {
  return value === null ? nullBecause(reason ?? 'no-data') : { value };
}

function round(x: number): number {
  return Math.round(x * 1000) / 1000;
}

/**
 * MTBF, its bounds, MTTR, mean active repair time and both availabilities from the operating time of
 * some units and a list of failures. Formulas in reliability.ts (NIST/SEMATECH e-Handbook §8.4.5.1
 * for the bounds; IEC 60050-192, EN 13306, EN 15341 for the terms). T and uptime/downtime are the sums
 * over the units (pooled unit time); MTTR takes the out-of-service window of each failure, else
 * completed − reported, else leaves it out (`mttrBasis` counts each).
 */
function figuresOf(
  asset: string | null,
  scope: string[],
  units: UnitTime[],
  failures: readonly ReliabilityWorkOrder[],
  confidence: number,
): Figures {
  const sum = (pick: (u: UnitTime) => number) => units.reduce((acc, u) => acc + pick(u), 0);
  const T = sum((u) => u.hours);
  const uptime = sum((u) => u.uptimeHours);
  const downtime = sum((u) => u.downtimeHours);
  const notes = units.flatMap((u) => u.notes);
  const reasons: Record<string, NullReason> = {};
  const r = failures.length;

  const mtbf = mtbfWithBounds({ operatingHours: T, failures: r, confidence, terminated: 'time' });
  if (mtbf.reason) {
    reasons.mtbfHours = mtbf.reason;
    reasons.mtbfUpperHours = mtbf.reason;
    if (mtbf.lowerHours === null) reasons.mtbfLowerHours = mtbf.reason;
  }
  if (r === 0 && T > 0) {
    const alpha = 1 - confidence;
    notes.push(
      `No failures in the window: no MTBF point estimate and no upper bound. mtbfLowerHours is the zero-failure bound ` +
        `2T/χ²(1−α/2; 2) = T/(−ln(α/2)) with α = ${round(alpha)}, i.e. MTBF ≥ ${round(mtbf.lowerHours ?? 0)} h at one-sided ` +
        `confidence ${round(1 - alpha / 2)} (NIST/SEMATECH e-Handbook §8.4.5.1).`,
    );
  }

  const basis: MttrBasis = { outOfServiceWindow: 0, completedLessReported: 0, unknown: 0 };
  const restoration: number[] = [];
  for (const wo of failures) {
    if (wo.outOfServiceFrom && wo.outOfServiceTo) {
      basis.outOfServiceWindow++;
      restoration.push(hoursOf(wo.outOfServiceFrom, wo.outOfServiceTo));
    } else if (wo.completedAt) {
      basis.completedLessReported++;
      restoration.push(hoursOf(wo.reportedAt, wo.completedAt));
    } else {
      basis.unknown++;
    }
  }
  if (basis.completedLessReported > 0) {
    notes.push(
      `${basis.completedLessReported} of ${countOf(r, 'failure', 'failures')} ${agree(basis.completedLessReported, 'has', 'have')} no out-of-service window: ` +
        `${agree(basis.completedLessReported, 'its', 'their')} restoration time is completed − reported.`,
    );
  }
  if (basis.unknown > 0) {
    notes.push(
      `${basis.unknown} of ${countOf(r, 'failure', 'failures')} ${agree(basis.unknown, 'has', 'have')} neither an out-of-service window nor a completion: ` +
        `MTTR leaves ${agree(basis.unknown, 'it', 'them')} out.`,
    );
  }
  const mttr: Ratio = r === 0 ? nullBecause('no-failures') : restoration.length === 0 ? nullBecause('no-repairs') : mttrHours(restoration);
  if (mttr.value === null) reasons.mttrHours = mttr.reason;

  const repairs = failures.flatMap((wo) => (wo.startedAt && wo.completedAt ? [{ startedAt: wo.startedAt, completedAt: wo.completedAt }] : []));
  const active = meanActiveRepairHours(repairs);
  if (active.value === null) reasons.meanActiveRepairHours = active.reason;

  const availability = inherentAvailability(ratioOf(mtbf.mtbfHours, mtbf.reason), mttr);
  if (availability.value === null) reasons.availability = availability.reason;
  const operational = operationalAvailability(uptime, downtime);
  if (operational.value === null) reasons.operationalAvailability = operational.reason;

  return {
    asset,
    operatingHours: T,
    failures: r,
    mtbfHours: mtbf.mtbfHours,
    mtbfLowerHours: mtbf.lowerHours,
    mtbfUpperHours: mtbf.upperHours,
    mttrHours: mttr.value,
    availability: availability.value,
    operationalAvailability: operational.value,
    meanActiveRepairHours: active.value,
    scope,
    operatingTimeSource: weakestSource(units),
    reasons,
    operatingTime: {
      windowHours: units.length > 0 ? units[0]!.windowHours : 0,
      uptimeHours: uptime,
      downtimeHours: downtime,
      unknownHours: sum((u) => u.unknownHours),
      units: units.map((u) => ({ asset: u.asset, source: u.source, tag: u.tag, hours: u.hours })),
    },
    mttrBasis: basis,
    notes,
  };
}

/**
 * Reliability over [from, to) of the asset asked about and everything below it, or of the whole site.
 *
 * - Failures r: corrective work orders with a failure code, not cancelled, reported in the window, on an
 *   asset in scope (docs/design.md §6).
 * - Operating time T, hours: running time from the asset's run-status tag, else its nearest ancestor's
 *   ('run-status' / 'ancestor-run-status'; the first by name when an asset has several, noted), counted
 *   only where the tag has data (the rest of the window is of unknown state, noted); with no such tag,
 *   the window less the union of the out-of-service windows of the (non-cancelled) work orders on the
 *   asset and below it ('calendar-less-out-of-service'). For the whole site T is the sum over its
 *   top-level assets, and for a kind group the sum over the assets of that kind (pooled unit time of
 *   several repairable units, NIST §8.4.5.1 assumes a constant rate); the source given is then the
 *   weakest one in the sum, and `operatingTime.units` lists each.
 * - MTBF = T/r with two-sided time-terminated bounds at `confidence` (lower 2T/χ²_{1−α/2}(2r+2), upper
 *   2T/χ²_{α/2}(2r); NIST/SEMATECH e-Handbook §8.4.5.1). MTTR = total out-of-service hours of the failures / r
 *   (without an out-of-service window, completed − reported; `mttrBasis` counts each). Mean active repair =
 *   mean of completed − started. availability = MTBF/(MTBF+MTTR); operationalAvailability =
 *   uptime/(uptime + downtime) where the state is known.
 * - groupBy 'asset': one group per asset in scope with failures of its own or a run-status tag of its own,
 *   each with the figures of that asset and everything below it; 'kind': one group per asset kind, with the
 *   failures of the assets of that kind.
 * - Provenance: the failures and the orders whose out-of-service time was subtracted (at most
 *   PROVENANCE_CAP, noted), the tags used, the window, the tags' data spans and the out-of-service windows.
 *
 * Degenerate input: r = 0 → MTBF, upper bound, MTTR and availability null ('no-failures'), the lower bound
 * is the zero-failure bound (noted); T = 0 → every MTBF figure null ('no-operating-time'); no window (a site
 * without data) → from/to null and every figure null ('no-data').
 */
export function buildReliabilityReport(input: ReliabilityReportInput, window: ReliabilityWindow): ReliabilityAnswer {
  const { site, assets, asset, inScope } = input;
  const { confidence } = window;
  const codes = inScope.map((a) => a.code);
  const header = {
    site,
    confidence,
    sides: 'two-sided' as const,
    terminated: 'time' as const,
  };
  if (!window.from || !window.to) {
    const reasons: Record<string, NullReason> = {};
    for (const k of ['mtbfHours', 'mtbfLowerHours', 'mtbfUpperHours', 'mttrHours', 'availability', 'operationalAvailability', 'meanActiveRepairHours']) {
      reasons[k] = 'no-data';
    }
    return {
      ...header,
      from: window.from?.toISOString() ?? null,
      to: window.to?.toISOString() ?? null,
      asset: asset?.code ?? null,
      operatingHours: 0,
      failures: 0,
      mtbfHours: null,
      mtbfLowerHours: null,
      mtbfUpperHours: null,
      mttrHours: null,
      availability: null,
      operationalAvailability: null,
      meanActiveRepairHours: null,
      scope: codes,
      reasons,
      operatingTime: { windowHours: 0, uptimeHours: 0, downtimeHours: 0, unknownHours: 0, units: [] },
      mttrBasis: { outOfServiceWindow: 0, completedLessReported: 0, unknown: 0 },
      groups: [],
      notes: [`Site ${site} has no data to bound a window: give from and to, or import data first.`],
      provenance: { workOrders: [], tags: [], windows: [] },
    };
  }
  const from = window.from;
  const to = window.to;
  const { runTagOf, notes } = runStatusTagsByAsset(input.tags);
  notes.push(...input.historyNotes);
  const orders = input.workOrders;
  const failures = orders.filter((wo) => isFailure(wo) && wo.reportedAt >= from && wo.reportedAt < to);
  const histories = input.histories;

  const byTag = new Map<number, Omit<UnitTime, 'asset' | 'source'>>();
  const runStatusTime = (history: RunStatusHistoryInput) => {
    const cached = byTag.get(history.tag.id);
    if (cached) return cached;
    const windowHours = hoursOf(from, to);
    const until = history.dataUntil && history.dataUntil < to ? history.dataUntil : to;
    let time: Omit<UnitTime, 'asset' | 'source'>;
    if (!history.dataFrom || !history.dataUntil || history.dataUntil <= from || history.dataFrom >= to) {
      time = {
        tag: history.tag.name,
        hours: 0,
        uptimeHours: 0,
        downtimeHours: 0,
        unknownHours: windowHours,
        windowHours,
        notes: [`${history.tag.name} has no good run-status data in the window: no operating time is counted.`],
      };
    } else {
      const r = operatingTimeFromRunStatus(history.samples, { from, to: until }, { tag: history.tag.name, priorSample: history.priorSample });
      const unknownHours = r.unknownHours + hoursOf(until, to);
      time = {
        tag: history.tag.name,
        hours: r.hours,
        uptimeHours: r.uptimeHours,
        downtimeHours: r.downtimeHours,
        unknownHours,
        windowHours,
        notes:
          unknownHours > 0
            ? [`${history.tag.name} has run-status data from ${history.dataFrom.toISOString()} to ${history.dataUntil.toISOString()}: ${round(unknownHours)} h of the window are of unknown state and not counted.`]
            : [],
      };
    }
    byTag.set(history.tag.id, time);
    return time;
  };

  const calendarOrders = new Set<string>();
  const unitTime = (a: ReliabilityAsset): UnitTime => {
    const t = operatingTagOf(assets, runTagOf, a);
    if (t) return { asset: a.code, source: t.source, ...runStatusTime(histories.get(t.tag.id)!) };
    const below = new Set(subtree(assets, a).map((x) => x.id));
    const oos: OutOfServiceWindow[] = orders
      .filter((wo) => below.has(wo.assetId) && wo.status !== 'cancelled' && wo.outOfServiceFrom && wo.outOfServiceTo)
      .map((wo) => ({ from: wo.outOfServiceFrom!, to: wo.outOfServiceTo!, ref: wo.woNumber }));
    const r = operatingTimeFromCalendar({ from, to }, oos);
    for (const ref of r.outOfServiceRefs) calendarOrders.add(ref);
    return {
      asset: a.code,
      source: r.source,
      tag: null,
      hours: r.hours,
      uptimeHours: r.uptimeHours,
      downtimeHours: r.downtimeHours,
      unknownHours: 0,
      windowHours: r.windowHours,
      notes: [`${a.code} and its ancestors have no run-status tag: operating time is calendar time less out-of-service windows.`, ...r.notes],
    };
  };

  const idsOf = (list: readonly ReliabilityAsset[]) => new Set(list.map((a) => a.id));
  const failuresIn = (ids: Set<number>) => failures.filter((wo) => ids.has(wo.assetId));

  // Top level: the asset, or the sum over the site's top-level assets.
  const topUnits = asset ? [unitTime(asset)] : assets.filter((a) => a.parentId === null).map(unitTime);
  const top = figuresOf(asset?.code ?? null, codes, topUnits, failuresIn(idsOf(inScope)), confidence);
  if (!asset && topUnits.length > 1) {
    top.notes.unshift(`Whole site: operating time is the sum over its ${topUnits.length} top-level assets (${topUnits.map((u) => `${u.asset} ${u.source}`).join(', ')}).`);
  }

  const groups: ReliabilityAnswer['groups'] = [];
  if (window.groupBy === 'asset') {
    const withFailures = new Set(failures.map((wo) => wo.assetId));
    for (const a of inScope) {
      if (!withFailures.has(a.id) && !runTagOf.has(a.id)) continue;
      const below = subtree(assets, a);
      groups.push({ key: `asset=${a.code}`, ...figuresOf(a.code, below.map((x) => x.code), [unitTime(a)], failuresIn(idsOf(below)), confidence) });
    }
  } else if (window.groupBy === 'kind') {
    const kinds = [...new Set(inScope.map((a) => a.kind))].sort();
    for (const kind of kinds) {
      const members = inScope.filter((a) => a.kind === kind);
      groups.push({ key: `kind=${kind}`, ...figuresOf(null, members.map((a) => a.code), members.map(unitTime), failuresIn(idsOf(members)), confidence) });
    }
  }

  // Provenance: the failures, the orders whose out-of-service time was subtracted, tags and windows used.
  const provenanceNotes: string[] = [];
  const usedOrders = orders.filter((wo) => failures.includes(wo) || calendarOrders.has(wo.woNumber));
  const usedTags = [...new Set([...topUnits, ...groups.flatMap((g) => g.operatingTime.units)].map((u) => u.tag).filter((t): t is string => t !== null))];
  const windows: Provenance['windows'] = [{ from: from.toISOString(), to: to.toISOString(), what: 'window' }];
  for (const h of histories.values()) {
    if (usedTags.includes(h.tag.name) && h.dataFrom && h.dataUntil) {
      windows.push({ from: h.dataFrom.toISOString(), to: h.dataUntil.toISOString(), what: `run-status data of ${h.tag.name}` });
    }
  }
  for (const wo of usedOrders) {
    if (wo.outOfServiceFrom && wo.outOfServiceTo) {
      windows.push({ from: wo.outOfServiceFrom.toISOString(), to: wo.outOfServiceTo.toISOString(), what: `out of service ${wo.woNumber}` });
    }
  }
  const provenance: Provenance = {
    workOrders: capped(
      usedOrders.map((wo) => wo.woNumber),
      'work orders',
      provenanceNotes,
    ),
    tags: usedTags,
    windows: capped(windows, 'windows', provenanceNotes),
  };
  return {
    ...header,
    from: from.toISOString(),
    to: to.toISOString(),
    ...top,
    notes: [...notes, ...top.notes, ...provenanceNotes],
    groups,
    provenance,
  };
}
