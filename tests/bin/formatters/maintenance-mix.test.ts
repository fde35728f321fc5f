import { describe, expect, it } from 'vitest';
import { maintenanceMixReportSchema } from '#shared/schemas/maintenance-mix.ts';
import { formatMaintenanceMix } from '#bin/formatters/maintenance-mix.ts';
import { freshAnswer } from '../../fixtures/freshness.ts';

// The hand-worked day of tests/server/services/maintenance-mix.test.ts (invented plant).
const report = maintenanceMixReportSchema.parse({
  ...freshAnswer,
  site: 'MIX',
  asset: 'T1',
  from: '2021-01-01T00:00:00.000Z',
  to: '2021-01-02T00:00:00.000Z',
  labour: { plannedHours: 4, reactiveHours: 6, improvementHours: 0, totalHours: 10, plannedShare: 0.4, reactiveShare: 0.6, improvementShare: 0, reason: null, workOrders: ['W1', 'W2', 'W5'] },
  pmCompliance: { definition: 'd', raised: 3, cancelled: 1, due: 2, completedInWindow: 1, compliance: 0.5, reason: null, completed: ['W2'], missed: ['W3'] },
  backlog: { workOrders: 1, hours: 4, withoutEstimate: 0, crewCapacityHoursPerWeek: 160, weeks: 0.025, reason: null, list: ['W3'] },
  cost: { labourCost: 480, partsCost: 120, totalCost: 600, producedM3: null, costPerM3: null, reason: 'No permeate_flow tag on train T2.' },
  currency: 'EUR',
  notes: ['1 closed work order(s) in the window have no labour hours booked.'],
  provenance: { workOrders: ['W1', 'W2', 'W3', 'W4', 'W5'], workOrderCount: 5, tags: [], trains: ['T1'], windows: [] },
});

const cells = (line: string) => line.split('│').map((c) => c.trim()).filter(Boolean);

describe('formatMaintenanceMix', () => {
  const lines = formatMaintenanceMix(report).split('\n');
  const row = (label: string) => cells(lines.find((l) => l.includes(label))!);

  it('prints shares as percentages, compliance with its counts, backlog in hours and weeks', () => {
    expect(row('planned share')).toEqual(['planned share of hours', '40 %']);
    expect(row('reactive share')).toEqual(['reactive share of hours', '60 %']);
    expect(row('PM compliance')).toEqual(['PM compliance', '50 % (1 of 2)']);
    expect(row('backlog (work orders')).toEqual(['backlog (work orders / hours)', '1 / 4']);
    expect(row('weeks of crew')).toEqual(['backlog (weeks of crew capacity)', '0.03']);
  });

  it('shows a missing cost per m³ as a dash with the reason, and the notes', () => {
    expect(row('cost per m³')).toEqual(['cost per m³ (EUR/m³)', '—', 'No permeate_flow tag on train T2.']);
    expect(row('maintenance cost')).toEqual(['maintenance cost (EUR)', '600']);
    expect(lines.at(-1)).toBe('Note: 1 closed work order(s) in the window have no labour hours booked.');
    expect(lines[0]).toBe('Maintenance mix — site MIX, asset T1, 2021-01-01T00:00:00.000Z to 2021-01-02T00:00:00.000Z');
  });
});
