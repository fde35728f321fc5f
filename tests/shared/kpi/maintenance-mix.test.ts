import { describe, expect, it } from 'vitest';
import { maintenanceMix, pmComplianceDefinition, type MaintenanceMixInput, type MixWorkOrder } from '#shared/kpi/maintenance-mix.ts';
import { maintenanceMixQuerySchema, maintenanceMixReportSchema } from '#shared/schemas/maintenance-mix.ts';

// Hand-worked invented work orders; window Q1 2024 = [1 Jan, 1 Apr), UTC.
const t = (iso: string) => new Date(`${iso}T00:00:00Z`);
const window = { from: t('2024-01-01'), to: t('2024-04-01') };

function wo(
  woNumber: string,
  type: MixWorkOrder['type'],
  status: MixWorkOrder['status'],
  reported: string,
  completed: string | null,
  labourHours: number,
  labourCost = 0,
  partsCost = 0,
): MixWorkOrder {
  return {
    woNumber,
    type,
    status,
    reportedAt: t(reported),
    startedAt: completed === null ? null : t(reported),
    completedAt: completed === null ? null : t(completed),
    labourHours,
    labourCost,
    partsCost,
  };
}

const orders: MixWorkOrder[] = [
  wo('PM-0', 'preventive', 'closed', '2023-12-28', '2024-01-02', 2, 100, 0), // raised before, completed in the window
  wo('PM-1', 'preventive', 'closed', '2024-01-05', '2024-01-06', 6, 300, 50),
  wo('PM-2', 'preventive', 'closed', '2024-02-10', '2024-04-03', 4, 200, 0), // completed after the window: late
  wo('PM-3', 'preventive', 'cancelled', '2024-03-01', null, 0),
  wo('PM-4', 'preventive', 'open', '2024-03-20', null, 5),
  wo('PD-1', 'predictive', 'closed', '2024-01-15', '2024-01-16', 2, 100, 0),
  wo('IN-1', 'inspection', 'closed', '2024-02-01', '2024-02-01', 1, 50, 0),
  wo('CM-0', 'corrective', 'closed', '2023-12-20', '2023-12-22', 7, 350, 90), // entirely before the window
  wo('CM-1', 'corrective', 'closed', '2024-02-03', '2024-02-05', 10, 500, 1200),
  wo('CM-2', 'corrective', 'in_progress', '2024-03-25', null, 8),
  wo('CM-3', 'corrective', 'open', '2024-04-05', null, 3), // raised after the window
  wo('IM-1', 'improvement', 'closed', '2024-03-10', '2024-03-12', 3, 150, 400),
];

const input: MaintenanceMixInput = { window, workOrders: orders, crewCapacityHoursPerWeek: 34, producedM3: 95_000 };

describe('maintenance mix (hand-worked quarter)', () => {
  const mix = maintenanceMix(input);

  it('splits labour hours of orders completed in the window into planned, reactive and improvement', () => {
    // Planned: PM-0 2 + PM-1 6 + PD-1 2 + IN-1 1 = 11 h; reactive: CM-1 10 h; improvement: IM-1 3 h; total 24 h.
    expect(mix.labour).toEqual({
      plannedHours: 11,
      reactiveHours: 10,
      improvementHours: 3,
      totalHours: 24,
      plannedShare: 11 / 24,
      reactiveShare: 10 / 24,
      improvementShare: 3 / 24,
      reason: null,
      workOrders: ['PM-0', 'PM-1', 'PD-1', 'IN-1', 'CM-1', 'IM-1'],
    });
  });

  it('computes PM compliance by its stated definition', () => {
    // Raised in the window: PM-1, PM-2, PM-3 (cancelled), PM-4 → due 3; completed before 1 Apr: PM-1 → 1/3.
    expect(mix.pmCompliance).toEqual({
      definition: pmComplianceDefinition,
      raised: 4,
      cancelled: 1,
      due: 3,
      completedInWindow: 1,
      compliance: 1 / 3,
      reason: null,
      completed: ['PM-1'],
      missed: ['PM-2', 'PM-4'],
    });
  });

  it('counts cancelled PMs as missed when asked', () => {
    const strict = maintenanceMix({ ...input, cancelledPmCountsAsMissed: true }).pmCompliance;
    expect(strict.due).toBe(4);
    expect(strict.compliance).toBe(1 / 4);
    expect(strict.missed).toEqual(['PM-2', 'PM-3', 'PM-4']);
  });

  it('measures the backlog open at the window end in hours and crew weeks', () => {
    // PM-2 (closed only on 3 Apr) 4 h + PM-4 5 h + CM-2 8 h = 17 h; 17 / 34 h per week = 0.5 week.
    expect(mix.backlog).toEqual({
      workOrders: 3,
      hours: 17,
      withoutEstimate: 0,
      crewCapacityHoursPerWeek: 34,
      weeks: 0.5,
      reason: null,
      list: ['PM-2', 'PM-4', 'CM-2'],
    });
  });

  it('divides maintenance cost by the volume produced', () => {
    // Labour 100 + 300 + 100 + 50 + 500 + 150 = 1200; parts 50 + 1200 + 400 = 1650; 2850 / 95 000 m³ = 0.03.
    expect(mix.cost).toEqual({ labourCost: 1200, partsCost: 1650, totalCost: 2850, producedM3: 95_000, costPerM3: 2850 / 95_000, reason: null });
    expect(mix.cost.costPerM3).toBeCloseTo(0.03, 15);
  });
});

describe('degenerate input: null with a reason, never NaN', () => {
  it('answers no work orders with zeros and reasons', () => {
    const mix = maintenanceMix({ window, workOrders: [], crewCapacityHoursPerWeek: 40, producedM3: 1000 });
    expect(mix.labour).toMatchObject({ totalHours: 0, plannedShare: null, reactiveShare: null, improvementShare: null, reason: 'No closed work order was completed in the window.' });
    expect(mix.pmCompliance).toMatchObject({ due: 0, compliance: null, reason: 'No preventive work order was raised in the window.' });
    expect(mix.backlog).toMatchObject({ workOrders: 0, hours: 0, weeks: 0, reason: null });
    expect(mix.cost).toMatchObject({ totalCost: 0, costPerM3: 0, reason: null });
  });

  it.each([
    ['no crew capacity', { crewCapacityHoursPerWeek: null }, 'backlog', 'weeks', 'No weekly crew capacity is set.'],
    ['zero crew capacity', { crewCapacityHoursPerWeek: 0 }, 'backlog', 'weeks', 'The weekly crew capacity is zero.'],
    ['unknown production', { producedM3: null }, 'cost', 'costPerM3', 'The volume produced in the window is not known.'],
    ['zero production', { producedM3: 0 }, 'cost', 'costPerM3', 'Nothing was produced in the window.'],
  ] as const)('%s', (_label, patch, block, field, reason) => {
    const mix = maintenanceMix({ ...input, ...patch });
    const part = mix[block] as unknown as Record<string, unknown>;
    expect(part[field]).toBeNull();
    expect(part.reason).toBe(reason);
  });

  it('says why shares are null when closed orders carry no hours, and flags backlog orders without an estimate', () => {
    const mix = maintenanceMix({
      window,
      workOrders: [wo('CM-1', 'corrective', 'closed', '2024-02-01', '2024-02-02', 0), wo('CM-2', 'corrective', 'open', '2024-02-01', null, 0)],
      crewCapacityHoursPerWeek: 40,
      producedM3: 1,
    });
    expect(mix.labour.reason).toBe('The closed work orders in the window have no labour hours booked.');
    expect(mix.backlog.withoutEstimate).toBe(1);
    expect(mix.notes).toEqual([
      '1 closed work order in the window has no labour hours booked.',
      '1 backlog work order has no labour-hour estimate: backlog hours understate the work.',
    ]);
  });

  it('says so when every PM raised in the window was cancelled', () => {
    const mix = maintenanceMix({ ...input, workOrders: [wo('PM-9', 'preventive', 'cancelled', '2024-02-01', null, 0)] });
    expect(mix.pmCompliance).toMatchObject({ raised: 1, due: 0, compliance: null, reason: 'Every preventive work order raised in the window was cancelled.' });
  });

  it('treats an empty window as containing nothing', () => {
    const mix = maintenanceMix({ ...input, window: { from: window.from, to: window.from } });
    expect(mix.labour.totalHours).toBe(0);
    expect(mix.pmCompliance.compliance).toBeNull();
  });

  it.each([
    ['a negative capacity', { crewCapacityHoursPerWeek: -1 }, /crewCapacityHoursPerWeek/],
    ['negative production', { producedM3: -5 }, /producedM3/],
    ['negative labour hours', { workOrders: [wo('X', 'corrective', 'closed', '2024-02-01', '2024-02-02', -1)] }, /labourHours/],
    ['a closed order without completion', { workOrders: [wo('X', 'corrective', 'closed', '2024-02-01', null, 1)] }, /closed without a completion time/],
    ['completion before report', { workOrders: [wo('X', 'corrective', 'closed', '2024-02-05', '2024-02-01', 1)] }, /completed before it was reported/],
    ['a duplicate number', { workOrders: [orders[1]!, orders[1]!] }, /listed twice/],
    ['a reversed window', { window: { from: window.to, to: window.from } }, /invalid-window/],
  ] as const)('refuses %s', (_label, patch, message) => {
    expect(() => maintenanceMix({ ...input, ...patch })).toThrow(message);
  });
});

describe('answer and query schemas', () => {
  it('accepts the parts of the answer, including ones full of nulls', () => {
    const parts = maintenanceMixReportSchema.pick({ from: true, to: true, labour: true, pmCompliance: true, backlog: true, cost: true, notes: true });
    expect(() => parts.parse(maintenanceMix(input))).not.toThrow();
    const empty = maintenanceMix({ window, workOrders: [], crewCapacityHoursPerWeek: null, producedM3: null });
    expect(() => parts.parse(empty)).not.toThrow();
  });

  it('parses the query with its default', () => {
    expect(maintenanceMixQuerySchema.parse({ from: '2024-01-01' })).toMatchObject({ cancelledPmCountsAsMissed: false, confidence: 0.9 });
    expect(maintenanceMixQuerySchema.parse({ cancelledPmCountsAsMissed: 'yes' }).cancelledPmCountsAsMissed).toBe(true);
  });
});
