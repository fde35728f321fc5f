// buildMaintenanceMixReport (shared/kpi/maintenance-mix-report.ts) on hand-worked invented rows, without a
// database. Rules: docs/design.md §6 (Maintenance mix: shares of labour hours, PM compliance, backlog in weeks of
// crew capacity, cost per m³ of permeate integrated from hourly means); indicator families as in EN 15341 (from memory).
import { describe, expect, it } from 'vitest';
import type { MixWorkOrder } from '#shared/kpi/maintenance-mix.ts';
import {
  buildMaintenanceMixReport,
  maintenanceMixWindow,
  type MaintenanceMixReportInput,
  type MixAsset,
  type MixTag,
} from '#shared/kpi/maintenance-mix-report.ts';
import { beforeFreshnessSchema } from '#shared/schemas/common.ts';
import { maintenanceMixReportSchema } from '#shared/schemas/maintenance-mix.ts';

const t = (iso: string) => new Date(iso);
const day = { from: t('2024-05-01T00:00:00Z'), to: t('2024-05-02T00:00:00Z'), now: t('2024-09-01T00:00:00Z'), cancelledPmCountsAsMissed: false };
const settings = { crewHoursPerWeek: 40, currency: 'EUR' };

// T1 (train) makes its permeate in two stages; T2 has a permeate tag of its own (and one on its stage, not counted
// twice); F is a filter under no train.
const asset = (id: number, code: string, kind: MixAsset['kind'], parentId: number | null = null): MixAsset => ({ id, code, kind, parentId });
const T1 = asset(1, 'T1', 'train');
const S1 = asset(2, 'T1-S1', 'stage', 1);
const S2 = asset(3, 'T1-S2', 'stage', 1);
const P = asset(4, 'T1-P', 'pump', 1);
const T2 = asset(5, 'T2', 'train');
const T2S = asset(6, 'T2-S1', 'stage', 5);
const F = asset(7, 'F', 'filter');
const assets = [T1, S1, S2, P, T2, T2S, F];
const tag = (id: number, name: string, on: MixAsset, quantity: MixTag['quantity'] = 'permeate_flow'): MixTag => ({ id, name, assetId: on.id, quantity });
const tags = [tag(20, 'T1-S1.QP', S1), tag(21, 'T1-S2.QP', S2), tag(22, 'T1.RUN', T1, 'run_status'), tag(23, 'T2.QP', T2), tag(24, 'T2-S1.QP', T2S)];

const wo = (woNumber: string, type: MixWorkOrder['type'], status: MixWorkOrder['status'], reported: string, completed: string | null, labourHours: number, labourCost: number, partsCost: number): MixWorkOrder => ({
  woNumber,
  type,
  status,
  reportedAt: t(reported),
  startedAt: null,
  completedAt: completed === null ? null : t(completed),
  labourHours,
  labourCost,
  partsCost,
});
const workOrders = [
  wo('CM-1', 'corrective', 'closed', '2024-05-01T02:00:00Z', '2024-05-01T08:00:00Z', 6, 300, 100),
  wo('PM-1', 'preventive', 'closed', '2024-05-01T01:00:00Z', '2024-05-01T03:00:00Z', 2, 100, 0),
  wo('PM-2', 'preventive', 'open', '2024-05-01T05:00:00Z', null, 4, 0, 0),
];

// T1-S1.QP: 600 m³ over the whole day; T1-S2.QP: 400 m³ from the 12 hours it has data; T2.QP: 500 m³.
const permeate = [
  { tagId: 20, integral: 600, hoursCovered: 24 },
  { tagId: 21, integral: 400, hoursCovered: 12 },
  { tagId: 23, integral: 500, hoursCovered: 24 },
];
const ofT1: MaintenanceMixReportInput = { site: 'MIX', assets, asset: T1, inScope: [T1, S1, S2, P], workOrders, tags, permeate: permeate.slice(0, 2) };

const exact = (answer: ReturnType<typeof buildMaintenanceMixReport>) => expect(beforeFreshnessSchema(maintenanceMixReportSchema).parse(answer)).toEqual(answer);

describe('buildMaintenanceMixReport', () => {
  const r = buildMaintenanceMixReport(ofT1, day, settings);

  it('answers exactly the schema', () => exact(r));

  it('gives the mix of the orders: shares, PM compliance and backlog in weeks', () => {
    // Closed in the window: PM-1 2 h (planned), CM-1 6 h (reactive) → 2/8 = 0.25, 6/8 = 0.75.
    expect(r.labour).toMatchObject({ plannedHours: 2, reactiveHours: 6, totalHours: 8, plannedShare: 0.25, reactiveShare: 0.75 });
    // PM-1 and PM-2 raised, PM-1 done → 1/2.
    expect(r.pmCompliance).toMatchObject({ raised: 2, due: 2, completedInWindow: 1, compliance: 0.5 });
    // PM-2 open at the end: 4 h / 40 h per week = 0.1 week.
    expect(r.backlog).toMatchObject({ workOrders: 1, hours: 4, list: ['PM-2'], weeks: 0.1 });
  });

  it('sets the cost against the permeate of the train, added up over its stages', () => {
    // 300 + 100 labour, 100 parts = 500; 600 + 400 = 1000 m³ → 0.5 per m³.
    expect(r.cost).toEqual({ labourCost: 400, partsCost: 100, totalCost: 500, producedM3: 1000, costPerM3: 0.5, reason: null });
    expect(r.notes).toEqual([
      "Permeate tag T1-S2.QP has hourly data for 12.0 of the window's 24.0 h; hours without data add no production, so the cost per m³ may be overstated.",
    ]);
    expect(r).toMatchObject({ site: 'MIX', asset: 'T1', currency: 'EUR', from: '2024-05-01T00:00:00.000Z', to: '2024-05-02T00:00:00.000Z' });
  });

  it('gives as provenance every order read, the permeate tags, the trains and the window', () => {
    expect(r.provenance).toEqual({
      workOrders: ['CM-1', 'PM-1', 'PM-2'],
      workOrderCount: 3,
      tags: ['T1-S1.QP', 'T1-S2.QP'],
      trains: ['T1'],
      windows: [{ from: '2024-05-01T00:00:00.000Z', to: '2024-05-02T00:00:00.000Z', what: 'maintenance-mix window' }],
    });
  });

  it('for an asset below a train, uses that train; site-wide, every train, a train’s own tag before its stages’', () => {
    const pump = buildMaintenanceMixReport({ ...ofT1, asset: P, inScope: [P] }, day, settings);
    expect([pump.asset, pump.cost.producedM3, pump.provenance.trains]).toEqual(['T1-P', 1000, ['T1']]);
    const site = buildMaintenanceMixReport({ ...ofT1, asset: null, inScope: assets, permeate }, day, settings);
    exact(site);
    expect(site).not.toHaveProperty('asset');
    // 600 + 400 + 500 (T2.QP; T2-S1.QP is left out) = 1500 m³.
    expect(site.cost.producedM3).toBe(1500);
    expect(site.provenance.tags).toEqual(['T1-S1.QP', 'T1-S2.QP', 'T2.QP']);
  });
});

describe('degenerate input', () => {
  it('a train without a permeate tag: cost per m³ null, and why', () => {
    const r = buildMaintenanceMixReport({ ...ofT1, asset: null, inScope: assets, tags: tags.slice(0, 3), permeate: [] }, day, settings);
    exact(r);
    expect(r.cost).toMatchObject({ producedM3: null, costPerM3: null, reason: 'No permeate_flow tag on train T2 or its stages, so the volume produced is not known.' });
    expect(r.provenance).toMatchObject({ tags: [], trains: ['T1', 'T2'] });
  });

  it('no train in scope, or tags without hourly data: null with the reason', () => {
    const filter = buildMaintenanceMixReport({ ...ofT1, asset: F, inScope: [F], tags: [], permeate: [] }, day, settings);
    expect(filter.cost.reason).toBe('There is no train in this scope, so no permeate production to set the cost against.');
    const unread = buildMaintenanceMixReport({ ...ofT1, permeate: [] }, day, settings);
    expect(unread.cost.reason).toBe('The permeate_flow tags have no hourly data in the window (import the historian, then run osmia refresh).');
    expect(unread.provenance.tags).toEqual(['T1-S1.QP', 'T1-S2.QP']);
  });

  it('no data at all: an empty window at the time of asking, nulls with reasons, never NaN', () => {
    const none: MaintenanceMixReportInput = { site: 'NODATA', assets: [], asset: null, inScope: [], workOrders: [], tags: [], permeate: [] };
    const r = buildMaintenanceMixReport(none, { ...day, from: null, to: null }, settings);
    exact(r);
    expect([r.from, r.to]).toEqual(['2024-09-01T00:00:00.000Z', '2024-09-01T00:00:00.000Z']);
    expect(r.notes).toEqual(['The site has no data yet, so the window is empty.']);
    expect([r.labour.plannedShare, r.pmCompliance.compliance, r.backlog.weeks, r.cost.costPerM3]).toEqual([null, null, 0, null]);
    expect(JSON.stringify(r)).not.toMatch(/NaN|Infinity/);
  });

  it('the window: the bounds given; without an end, now; without a start, the end', () => {
    expect(maintenanceMixWindow(day)).toEqual({ from: day.from, to: day.to });
    expect(maintenanceMixWindow({ from: day.from, to: null, now: day.now })).toEqual({ from: day.from, to: day.now });
    expect(maintenanceMixWindow({ from: null, to: day.to, now: day.now })).toEqual({ from: day.to, to: day.to });
  });
});
