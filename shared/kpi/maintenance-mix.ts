// Maintenance mix over a half-open window [from, to): planned vs reactive labour, PM compliance,
// backlog in weeks and maintenance cost per m³ produced (docs/design.md §6).
//
// EN 15341 (maintenance key performance indicators) sets out indicators of this kind — shares of
// preventive and corrective man-hours, maintenance cost per unit of output, backlog (from memory; no
// indicator numbers cited). The exact rules below are ours and are stated so any figure can be rebuilt.

import type { WorkOrderType } from '#shared/schemas/enums.ts';
import type { MaintenanceMixReport } from '#shared/schemas/maintenance-mix.ts';
import { agree, countOf } from '../text.ts';
import { instantError, validMs, windowMs, type TimeWindow } from './operating-time.ts';
import type { WorkOrderRecord } from './work-orders.ts';

/** What the maintenance-mix rules read of a work order (`labourHours`: booked on a closed order, the estimate of an open one). */
export type MixWorkOrder = Pick<
  WorkOrderRecord,
  'woNumber' | 'type' | 'status' | 'reportedAt' | 'startedAt' | 'completedAt' | 'labourHours' | 'labourCost' | 'partsCost'
>;

export interface MaintenanceMixInput {
  window: TimeWindow;
  /** Work orders of the site or asset scope (the caller filters by asset). */
  workOrders: readonly MixWorkOrder[];
  /** Weekly labour capacity of the crews, hours per week; null when not known. */
  crewCapacityHoursPerWeek: number | null;
  /** Permeate produced in the window, m³; null when not known. */
  producedM3: number | null;
  /** Count cancelled preventive orders as missed PMs (default false: they leave the denominator). */
  cancelledPmCountsAsMissed?: boolean;
}

/** Planned work: preventive, predictive and inspection. Reactive: corrective. Improvement is neither. */
export const plannedTypes: readonly WorkOrderType[] = ['preventive', 'predictive', 'inspection'];
export const reactiveTypes: readonly WorkOrderType[] = ['corrective'];

export const pmComplianceDefinition =
  'PM compliance = preventive work orders raised (reported) in the window and closed with a completion time ' +
  'before the window end, divided by the preventive work orders raised in the window that were not cancelled ' +
  '(cancelled ones count as missed instead when that option is set).';

// The parts of the answer are the types of its schema (shared/schemas/maintenance-mix.ts), not interfaces beside it.
export type LabourMix = MaintenanceMixReport['labour'];
export type PmCompliance = MaintenanceMixReport['pmCompliance'];
export type Backlog = MaintenanceMixReport['backlog'];
export type MaintenanceCost = MaintenanceMixReport['cost'];
/** The calculated part of the answer; `buildMaintenanceMixReport` adds site, asset, currency and provenance. */
export type MaintenanceMixResult = Pick<MaintenanceMixReport, 'from' | 'to' | 'labour' | 'pmCompliance' | 'backlog' | 'cost' | 'notes'>;

const isNonNegative = (value: number) => typeof value === 'number' && Number.isFinite(value) && value >= 0;

function nonNegative(value: number, what: string): void {
  if (!isNonNegative(value)) {
    throw new RangeError(`${what} must be a finite number ≥ 0, got ${String(value)}`);
  }
}

/** A checked order: what the rules read of it, with its instants in milliseconds. */
interface CheckedOrder {
  woNumber: string;
  type: WorkOrderType;
  status: MixWorkOrder['status'];
  labourHours: number;
  labourCost: number;
  partsCost: number;
  reportedMs: number;
  completedMs: number | null;
}

function checkOrders(orders: readonly MixWorkOrder[]): CheckedOrder[] {
  // Only the fields the rules read, built field by field, and an order named only in an error: this runs
  // over every order of the scope (tens of thousands on a large site).
  const what = (i: number) => `workOrders[${i}] (${orders[i]!.woNumber})`;
  return orders.map((wo, i) => {
    const reportedMs = validMs(wo.reportedAt);
    if (Number.isNaN(reportedMs)) throw instantError(wo.reportedAt, `${what(i)}.reportedAt`);
    const completedMs = wo.completedAt === null ? null : validMs(wo.completedAt);
    if (completedMs !== null && Number.isNaN(completedMs)) throw instantError(wo.completedAt, `${what(i)}.completedAt`);
    if (wo.startedAt !== null && Number.isNaN(validMs(wo.startedAt))) throw instantError(wo.startedAt, `${what(i)}.startedAt`);
    if (completedMs !== null && completedMs < reportedMs) throw new RangeError(`${what(i)}: completed before it was reported`);
    if (!isNonNegative(wo.labourHours)) nonNegative(wo.labourHours, `${what(i)}.labourHours`);
    if (!isNonNegative(wo.labourCost)) nonNegative(wo.labourCost, `${what(i)}.labourCost`);
    if (!isNonNegative(wo.partsCost)) nonNegative(wo.partsCost, `${what(i)}.partsCost`);
    if (wo.status === 'closed' && completedMs === null) throw new RangeError(`${what(i)}: closed without a completion time`);
    return {
      woNumber: wo.woNumber,
      type: wo.type,
      status: wo.status,
      labourHours: wo.labourHours,
      labourCost: wo.labourCost,
      partsCost: wo.partsCost,
      reportedMs,
      completedMs,
    };
  });
}

const share = (part: number, total: number) => part / total;

/**
 * Maintenance mix over [from, to).
 *
 * - Labour: closed work orders completed in the window. Planned share = hours of preventive + predictive +
 *   inspection orders ÷ all their hours; reactive share = corrective hours ÷ all; improvement the rest (so the
 *   three shares sum to 1). Units: hours, shares 0–1.
 * - PM compliance: see `pmComplianceDefinition` (0–1).
 * - Backlog at the window end: orders raised before `to`, not cancelled, and not completed before `to`
 *   (so a past window sees the orders that were open then); hours = their labour-hour estimates; weeks =
 *   hours ÷ weekly crew capacity.
 * - Cost per m³ = (labour cost + parts cost of the counted closed orders) ÷ permeate produced in the window.
 * Source: EN 15341 (indicator families, from memory); docs/design.md §6. Degenerate input: every ratio with a zero
 * or unknown denominator is null with its reason; an empty window or list gives zeros and nulls, never NaN.
 */
export function maintenanceMix(input: MaintenanceMixInput): MaintenanceMixResult {
  const w = windowMs(input.window);
  const orders = checkOrders(input.workOrders);
  const notes: string[] = [];
  const seen = new Set<string>();
  for (const wo of orders) {
    if (seen.has(wo.woNumber)) throw new RangeError(`work order ${wo.woNumber} is listed twice`);
    seen.add(wo.woNumber);
  }
  if (input.crewCapacityHoursPerWeek !== null) nonNegative(input.crewCapacityHoursPerWeek, 'crewCapacityHoursPerWeek');
  if (input.producedM3 !== null) nonNegative(input.producedM3, 'producedM3');
  const inWindow = (ms: number) => ms >= w.fromMs && ms < w.toMs;

  // Labour and cost: closed orders completed in the window.
  const counted = orders.filter((wo) => wo.status === 'closed' && wo.completedMs !== null && inWindow(wo.completedMs));
  const hoursOf = (types: readonly WorkOrderType[]) =>
    counted.filter((wo) => types.includes(wo.type)).reduce((acc, wo) => acc + wo.labourHours, 0);
  const plannedHours = hoursOf(plannedTypes);
  const reactiveHours = hoursOf(reactiveTypes);
  const improvementHours = hoursOf(['improvement']);
  const totalHours = plannedHours + reactiveHours + improvementHours;
  const noHours = totalHours === 0;
  const zeroHourOrders = counted.filter((wo) => wo.labourHours === 0).length;
  if (zeroHourOrders > 0) notes.push(`${countOf(zeroHourOrders, 'closed work order', 'closed work orders')} in the window ${agree(zeroHourOrders, 'has', 'have')} no labour hours booked.`);
  const labour: LabourMix = {
    plannedHours,
    reactiveHours,
    improvementHours,
    totalHours,
    plannedShare: noHours ? null : share(plannedHours, totalHours),
    reactiveShare: noHours ? null : share(reactiveHours, totalHours),
    improvementShare: noHours ? null : share(improvementHours, totalHours),
    reason: noHours
      ? counted.length === 0
        ? 'No closed work order was completed in the window.'
        : 'The closed work orders in the window have no labour hours booked.'
      : null,
    workOrders: counted.map((wo) => wo.woNumber),
  };

  // PM compliance.
  const raisedPm = orders.filter((wo) => wo.type === 'preventive' && inWindow(wo.reportedMs));
  const cancelled = raisedPm.filter((wo) => wo.status === 'cancelled');
  const countCancelled = input.cancelledPmCountsAsMissed ?? false;
  const duePm = countCancelled ? raisedPm : raisedPm.filter((wo) => wo.status !== 'cancelled');
  const completedPm = duePm.filter((wo) => wo.status === 'closed' && wo.completedMs !== null && wo.completedMs < w.toMs);
  const completedSet = new Set(completedPm.map((wo) => wo.woNumber));
  const pmCompliance: PmCompliance = {
    definition: pmComplianceDefinition,
    raised: raisedPm.length,
    cancelled: cancelled.length,
    due: duePm.length,
    completedInWindow: completedPm.length,
    compliance: duePm.length === 0 ? null : completedPm.length / duePm.length,
    reason:
      duePm.length === 0
        ? raisedPm.length === 0
          ? 'No preventive work order was raised in the window.'
          : 'Every preventive work order raised in the window was cancelled.'
        : null,
    completed: completedPm.map((wo) => wo.woNumber),
    missed: duePm.filter((wo) => !completedSet.has(wo.woNumber)).map((wo) => wo.woNumber),
  };

  // Backlog at the window end.
  const open = orders.filter(
    (wo) => wo.status !== 'cancelled' && wo.reportedMs < w.toMs && (wo.completedMs === null || wo.completedMs >= w.toMs),
  );
  const backlogHours = open.reduce((acc, wo) => acc + wo.labourHours, 0);
  const capacity = input.crewCapacityHoursPerWeek;
  const withoutEstimate = open.filter((wo) => wo.labourHours === 0).length;
  if (withoutEstimate > 0) notes.push(
      `${countOf(withoutEstimate, 'backlog work order', 'backlog work orders')} ${agree(withoutEstimate, 'has', 'have')} no labour-hour estimate: backlog hours understate the work.`,
    );
  const backlog: Backlog = {
    workOrders: open.length,
    hours: backlogHours,
    withoutEstimate,
    crewCapacityHoursPerWeek: capacity,
    weeks: capacity === null || capacity === 0 ? null : backlogHours / capacity,
    reason:
      capacity === null
        ? 'No weekly crew capacity is set.'
        : capacity === 0
          ? 'The weekly crew capacity is zero.'
          : null,
    list: open.map((wo) => wo.woNumber),
  };

  // Cost per m³ produced.
  const labourCost = counted.reduce((acc, wo) => acc + wo.labourCost, 0);
  const partsCost = counted.reduce((acc, wo) => acc + wo.partsCost, 0);
  const totalCost = labourCost + partsCost;
  const produced = input.producedM3;
  const cost: MaintenanceCost = {
    labourCost,
    partsCost,
    totalCost,
    producedM3: produced,
    costPerM3: produced === null || produced === 0 ? null : totalCost / produced,
    reason:
      produced === null
        ? 'The volume produced in the window is not known.'
        : produced === 0
          ? 'Nothing was produced in the window.'
          : null,
  };

  return {
    from: input.window.from.toISOString(),
    to: input.window.to.toISOString(),
    labour,
    pmCompliance,
    backlog,
    cost,
    notes,
  };
}
