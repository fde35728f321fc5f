// The reliability answer built from plain rows, without a database: a small invented plant worked by hand.
// Rules: docs/design.md §6 (Failure, Operating time T, MTBF with chi-square bounds, MTTR and availability).
// Bounds: NIST/SEMATECH e-Handbook of Statistical Methods §8.4.5.1 (time-terminated, two-sided: lower
// 2T/χ²(1−α/2; 2r+2), upper 2T/χ²(α/2; 2r); zero failures: T/(−ln(α/2))), quantiles from jstat (a reference library).
import jstat from 'jstat';
import { isDeepStrictEqual } from 'node:util';
import { describe, expect, it } from 'vitest';
import { PROVENANCE_CAP } from '#shared/kpi/provenance.ts';
import {
  buildReliabilityReport,
  operatingTimeTags,
  type ReliabilityAnswer,
  type ReliabilityAsset,
  type ReliabilityReportInput,
  type ReliabilityTag,
  type ReliabilityWorkOrder,
  type RunStatusHistoryInput,
} from '#shared/kpi/reliability-report.ts';
import { beforeFreshnessSchema } from '#shared/schemas/common.ts';
import { reliabilityReportSchema } from '#shared/schemas/reliability.ts';

const chi2 = (p: number, dof: number): number => jstat.jStat.chisquare.inv(p, dof);
const at = (iso: string) => new Date(iso);
const from = at('2025-01-01T00:00:00Z');
const to = at('2025-01-11T00:00:00Z'); // 240 h

// T1 (train, own run-status tag) with pump P1 and vessel V1; T2 (train, no tag) with pump P2.
const T1: ReliabilityAsset = { id: 1, code: 'T1', kind: 'train', parentId: null };
const P1: ReliabilityAsset = { id: 2, code: 'P1', kind: 'pump', parentId: 1 };
const V1: ReliabilityAsset = { id: 3, code: 'V1', kind: 'vessel', parentId: 1 };
const T2: ReliabilityAsset = { id: 4, code: 'T2', kind: 'train', parentId: null };
const P2: ReliabilityAsset = { id: 5, code: 'P2', kind: 'pump', parentId: 4 };
const assets = [T1, P1, V1, T2, P2];

const tags: ReliabilityTag[] = [
  { id: 10, name: 'T1.RUN', assetId: 1, assetCode: 'T1', quantity: 'run_status' },
  { id: 11, name: 'T1.RUN-B', assetId: 1, assetCode: 'T1', quantity: 'run_status' },
  { id: 12, name: 'T1.FLOW', assetId: 1, assetCode: 'T1', quantity: 'permeate_flow' },
];

// T1.RUN: running before the window, stopped Jan 3 06:00–18:00 (12 h) and Jan 8 00:00–08:00 (8 h) → 220 h running, 20 h down.
const t1Run: RunStatusHistoryInput = {
  tag: { id: 10, name: 'T1.RUN' },
  priorSample: { time: at('2024-12-31T00:00:00Z'), value: 1 },
  samples: [
    { time: at('2025-01-03T06:00:00Z'), value: 0 },
    { time: at('2025-01-03T18:00:00Z'), value: 1 },
    { time: at('2025-01-08T00:00:00Z'), value: 0 },
    { time: at('2025-01-08T08:00:00Z'), value: 1 },
  ],
  dataFrom: at('2024-12-01T00:00:00Z'),
  dataUntil: at('2025-02-01T00:00:00Z'),
};

const order = (o: Partial<ReliabilityWorkOrder> & Pick<ReliabilityWorkOrder, 'woNumber' | 'assetId' | 'reportedAt'>): ReliabilityWorkOrder => ({
  type: 'corrective',
  status: 'closed',
  failureCode: null,
  startedAt: null,
  completedAt: null,
  outOfServiceFrom: null,
  outOfServiceTo: null,
  ...o,
});
const WO1 = order({ woNumber: 'WO-1', assetId: 2, failureCode: 'SEAL', reportedAt: at('2025-01-03T06:00:00Z'), startedAt: at('2025-01-03T07:00:00Z'), completedAt: at('2025-01-03T15:00:00Z'), outOfServiceFrom: at('2025-01-03T06:00:00Z'), outOfServiceTo: at('2025-01-03T18:00:00Z') });
const WO2 = order({ woNumber: 'WO-2', assetId: 2, failureCode: 'BEARING', reportedAt: at('2025-01-08T00:00:00Z'), startedAt: at('2025-01-08T02:00:00Z'), completedAt: at('2025-01-08T06:00:00Z') });
const WO3 = order({ woNumber: 'WO-3', assetId: 2, status: 'cancelled', failureCode: 'SEAL', reportedAt: at('2025-01-05T00:00:00Z') });
const WO4 = order({ woNumber: 'WO-4', assetId: 3, type: 'preventive', reportedAt: at('2025-01-06T00:00:00Z') });
const WO5 = order({ woNumber: 'WO-5', assetId: 5, failureCode: 'MOTOR', reportedAt: at('2025-01-05T00:00:00Z'), startedAt: at('2025-01-05T02:00:00Z'), completedAt: at('2025-01-05T12:00:00Z'), outOfServiceFrom: at('2025-01-05T00:00:00Z'), outOfServiceTo: at('2025-01-05T10:00:00Z') });
const WO6 = order({ woNumber: 'WO-6', assetId: 4, type: 'inspection', reportedAt: at('2025-01-05T08:00:00Z'), outOfServiceFrom: at('2025-01-05T08:00:00Z'), outOfServiceTo: at('2025-01-05T14:00:00Z') });
const WO7 = order({ woNumber: 'WO-7', assetId: 5, status: 'open', failureCode: 'LEAK', reportedAt: at('2025-01-10T00:00:00Z') });
const WO8 = order({ woNumber: 'WO-8', assetId: 2, failureCode: 'SEAL', reportedAt: at('2024-12-20T00:00:00Z') }); // before the window
const orders = [WO1, WO2, WO3, WO4, WO5, WO6, WO7, WO8];

/** The input the service would read for the asset (or the site): work orders on assets in scope. */
function inputFor(asset: ReliabilityAsset | null, over: Partial<ReliabilityReportInput> = {}): ReliabilityReportInput {
  const inScope = asset ? subtreeOf(asset) : assets;
  const ids = new Set(inScope.map((a) => a.id));
  return {
    site: 'S',
    assets,
    asset,
    inScope,
    tags,
    workOrders: orders.filter((wo) => ids.has(wo.assetId)),
    histories: new Map([[10, t1Run]]),
    historyNotes: [],
    ...over,
  };
}
function subtreeOf(a: ReliabilityAsset): ReliabilityAsset[] {
  return [a, ...assets.filter((x) => x.parentId === a.id).flatMap(subtreeOf)];
}

const window = { from, to, confidence: 0.9, groupBy: 'all' as const };

/** The answer parses with its own schema and loses nothing in the parse: no field the schema does not declare. */
function checkedAgainstSchema(report: ReliabilityAnswer): ReliabilityAnswer {
  const parsed = beforeFreshnessSchema(reliabilityReportSchema).parse(report);
  expect(isDeepStrictEqual(JSON.parse(JSON.stringify(parsed)), JSON.parse(JSON.stringify(report)))).toBe(true);
  return report;
}

describe('operatingTimeTags: which histories the service reads', () => {
  it('names the nearest run-status tag of each asset in scope once, the first by name where an asset has several (docs/design.md §6)', () => {
    expect(operatingTimeTags(assets, [P1], tags).map((t) => t.name)).toEqual(['T1.RUN']);
    expect(operatingTimeTags(assets, assets, tags).map((t) => t.name)).toEqual(['T1.RUN']);
    expect(operatingTimeTags(assets, [T2, P2], tags)).toEqual([]);
  });
});

describe('a pump with two failures on its train’s run status', () => {
  const report = checkedAgainstSchema(buildReliabilityReport(inputFor(P1), window));

  it('counts corrective, coded, not cancelled orders reported in the window as failures (docs/design.md §6 Failure)', () => {
    // WO-1, WO-2; not WO-3 (cancelled), not WO-8 (reported before the window).
    expect(report.failures).toBe(2);
    expect(report.scope).toEqual(['P1']);
  });

  it('takes T from the train’s tag: 240 h less 12 h and 8 h stopped = 220 h (docs/design.md §6 Operating time T)', () => {
    expect(report.operatingTimeSource).toBe('ancestor-run-status');
    expect(report.operatingHours).toBeCloseTo(220, 12);
    expect(report.operatingTime).toEqual({
      windowHours: 240,
      uptimeHours: 220,
      downtimeHours: 20,
      unknownHours: 0,
      units: [{ asset: 'P1', source: 'ancestor-run-status', tag: 'T1.RUN', hours: 220 }],
    });
  });

  it('gives MTBF = T/r = 110 h with the handbook bounds at 90 % (NIST/SEMATECH §8.4.5.1)', () => {
    expect(report.mtbfHours).toBeCloseTo(110, 12);
    // α = 0.1: lower 440/χ²(0.95; 6) ≈ 440/12.592 = 34.94 h, upper 440/χ²(0.05; 4) ≈ 440/0.7107 = 619.1 h.
    expect(report.mtbfLowerHours).toBeCloseTo(440 / chi2(0.95, 6), 9);
    expect(report.mtbfUpperHours).toBeCloseTo(440 / chi2(0.05, 4), 9);
    expect(report.mtbfLowerHours).toBeCloseTo(34.94, 2);
  });

  it('gives MTTR (12 h window + 6 h completed − reported)/2 = 9 h, active repair (8 + 4)/2 = 6 h, and both availabilities (docs/design.md §6)', () => {
    expect(report.mttrHours).toBeCloseTo(9, 12);
    expect(report.mttrBasis).toEqual({ outOfServiceWindow: 1, completedLessReported: 1, unknown: 0 });
    expect(report.meanActiveRepairHours).toBeCloseTo(6, 12);
    expect(report.availability).toBeCloseTo(110 / 119, 12);
    expect(report.operationalAvailability).toBeCloseTo(220 / 240, 12);
    expect(report.reasons).toEqual({});
  });

  it('notes the unused second run-status tag first, then the MTTR fallback', () => {
    expect(report.notes).toEqual([
      'T1 has several run-status tags: T1.RUN is used, T1.RUN-B is not.',
      '1 of 2 failures has no out-of-service window: its restoration time is completed − reported.',
    ]);
  });

  it('gives as provenance the failures, the tag, the window, the tag’s data span and the out-of-service window used', () => {
    expect(report.provenance).toEqual({
      workOrders: ['WO-1', 'WO-2'],
      tags: ['T1.RUN'],
      windows: [
        { from: '2025-01-01T00:00:00.000Z', to: '2025-01-11T00:00:00.000Z', what: 'window' },
        { from: '2024-12-01T00:00:00.000Z', to: '2025-02-01T00:00:00.000Z', what: 'run-status data of T1.RUN' },
        { from: '2025-01-03T06:00:00.000Z', to: '2025-01-03T18:00:00.000Z', what: 'out of service WO-1' },
      ],
    });
    expect(report).toMatchObject({ site: 'S', asset: 'P1', from: '2025-01-01T00:00:00.000Z', to: '2025-01-11T00:00:00.000Z', sides: 'two-sided', terminated: 'time', groups: [] });
  });
});

describe('the whole site, grouped by kind', () => {
  const report = checkedAgainstSchema(buildReliabilityReport(inputFor(null), { ...window, groupBy: 'kind' }));

  it('sums the top-level assets: T1 220 h by run status + T2 240 − |00–10 ∪ 08–14| = 226 h by calendar (docs/design.md §6)', () => {
    expect(report.operatingHours).toBeCloseTo(446, 12);
    expect(report.operatingTimeSource).toBe('calendar-less-out-of-service');
    expect(report.operatingTime.units).toEqual([
      { asset: 'T1', source: 'run-status', tag: 'T1.RUN', hours: 220 },
      { asset: 'T2', source: 'calendar-less-out-of-service', tag: null, hours: 226 },
    ]);
    // Up 220 + 226, down 20 + 14.
    expect(report.operationalAvailability).toBeCloseTo(446 / 480, 12);
  });

  it('counts four failures, and MTTR over the three with a restoration time: (12 + 6 + 10)/3 h', () => {
    expect(report.failures).toBe(4);
    expect(report.mtbfHours).toBeCloseTo(446 / 4, 12);
    expect(report.mttrHours).toBeCloseTo(28 / 3, 12);
    expect(report.mttrBasis).toEqual({ outOfServiceWindow: 2, completedLessReported: 1, unknown: 1 });
    // WO-1 8 h, WO-2 4 h, WO-5 10 h.
    expect(report.meanActiveRepairHours).toBeCloseTo(22 / 3, 12);
  });

  it('says how the sum was made and which fallbacks were used, in order', () => {
    expect(report.notes).toEqual([
      'T1 has several run-status tags: T1.RUN is used, T1.RUN-B is not.',
      'Whole site: operating time is the sum over its 2 top-level assets (T1 run-status, T2 calendar-less-out-of-service).',
      'T2 and its ancestors have no run-status tag: operating time is calendar time less out-of-service windows.',
      '1 of 4 failures has no out-of-service window: its restoration time is completed − reported.',
      '1 of 4 failures has neither an out-of-service window nor a completion: MTTR leaves it out.',
    ]);
  });

  it('groups by kind in name order, each kind’s own failures over its pooled unit time', () => {
    expect(report.groups.map((g) => g.key)).toEqual(['kind=pump', 'kind=train', 'kind=vessel']);
    const [pump, train, vessel] = report.groups;
    // Pumps: P1 220 h (T1.RUN) + P2 240 − 10 h (WO-5 on P2 itself) = 450 h; r = 4.
    expect(pump).toMatchObject({ asset: null, scope: ['P1', 'P2'], failures: 4, operatingTimeSource: 'calendar-less-out-of-service' });
    expect(pump!.operatingHours).toBeCloseTo(450, 12);
    expect(pump!.mtbfHours).toBeCloseTo(112.5, 12);
    // Trains: no failure of their own → the zero-failure bound 446/(−ln 0.05) only.
    expect(train!.failures).toBe(0);
    expect(train!.mtbfLowerHours).toBeCloseTo(446 / -Math.log(0.05), 9);
    expect(train!.reasons).toMatchObject({ mtbfHours: 'no-failures', mtbfUpperHours: 'no-failures', mttrHours: 'no-failures', availability: 'no-failures', meanActiveRepairHours: 'no-repairs' });
    expect(vessel).toMatchObject({ scope: ['V1'], failures: 0, operatingTimeSource: 'ancestor-run-status', operatingHours: 220 });
  });

  it('lists the failures and the orders whose out-of-service time was subtracted, in number order', () => {
    expect(report.provenance.workOrders).toEqual(['WO-1', 'WO-2', 'WO-5', 'WO-6', 'WO-7']);
    expect(report.provenance.windows.map((w) => w.what)).toEqual(['window', 'run-status data of T1.RUN', 'out of service WO-1', 'out of service WO-5', 'out of service WO-6']);
  });
});

describe('grouped by asset', () => {
  it('gives one group per asset in scope with failures or a run-status tag of its own, over its subtree', () => {
    const report = checkedAgainstSchema(buildReliabilityReport(inputFor(T1), { ...window, groupBy: 'asset' }));
    expect(report.scope).toEqual(['T1', 'P1', 'V1']);
    expect(report.groups.map((g) => [g.key, g.scope, g.failures, g.operatingTimeSource])).toEqual([
      ['asset=T1', ['T1', 'P1', 'V1'], 2, 'run-status'],
      ['asset=P1', ['P1'], 2, 'ancestor-run-status'],
    ]);
    expect(report.groups[1]!.mtbfHours).toBeCloseTo(110, 12);
  });
});

describe('edges', () => {
  it('without a window: null window, every figure null for no-data, one note, no operating-time source', () => {
    const report = checkedAgainstSchema(buildReliabilityReport(inputFor(P1, { tags: [], workOrders: [], histories: new Map() }), { ...window, from: null, to: null }));
    expect(report).toMatchObject({ from: null, to: null, operatingHours: 0, failures: 0, mtbfHours: null, mtbfLowerHours: null, groups: [] });
    expect(Object.values(report.reasons)).toEqual(Array(7).fill('no-data'));
    expect(report.notes).toEqual(['Site S has no data to bound a window: give from and to, or import data first.']);
    expect(report.operatingTimeSource).toBeUndefined();
    expect(report.provenance).toEqual({ workOrders: [], tags: [], windows: [] });
  });

  it('no rows at all: the whole window by calendar, no failures, the zero-failure bound T/(−ln(α/2)) noted (NIST/SEMATECH §8.4.5.1)', () => {
    const lone: ReliabilityAsset = { id: 9, code: 'X', kind: 'pump', parentId: null };
    const report = checkedAgainstSchema(
      buildReliabilityReport({ site: 'S', assets: [lone], asset: null, inScope: [lone], tags: [], workOrders: [], histories: new Map(), historyNotes: [] }, window),
    );
    expect(report.operatingHours).toBe(240);
    expect(report.failures).toBe(0);
    expect(report.mtbfLowerHours).toBeCloseTo(240 / -Math.log(0.05), 9);
    expect(report.mtbfHours).toBeNull();
    expect(report.mttrHours).toBeNull();
    expect(report.notes.join(' ')).toMatch(/No failures in the window.*one-sided confidence 0\.95/);
  });

  it('a tag with no good data in the window: no operating time, every MTBF figure null for no-operating-time', () => {
    const empty: RunStatusHistoryInput = { tag: { id: 10, name: 'T1.RUN' }, samples: [], priorSample: null, dataFrom: null, dataUntil: null };
    const report = checkedAgainstSchema(
      buildReliabilityReport(inputFor(P1, { histories: new Map([[10, empty]]), historyNotes: ['T1.RUN has no good-quality run-status data.'] }), window),
    );
    expect(report.operatingHours).toBe(0);
    expect(report.operatingTime.unknownHours).toBe(240);
    expect(report.reasons).toMatchObject({ mtbfHours: 'no-operating-time', mtbfLowerHours: 'no-operating-time', operationalAvailability: 'no-time' });
    expect(report.notes.slice(0, 3)).toEqual([
      'T1 has several run-status tags: T1.RUN is used, T1.RUN-B is not.',
      'T1.RUN has no good-quality run-status data.',
      'T1.RUN has no good run-status data in the window: no operating time is counted.',
    ]);
  });

  it('data ending inside the window: the rest is of unknown state and not counted', () => {
    // Data until Jan 9 00:00: 192 h known (12 h + 8 h stopped → 172 h running), 48 h unknown.
    const short = { ...t1Run, dataUntil: at('2025-01-09T00:00:00Z') };
    const report = checkedAgainstSchema(buildReliabilityReport(inputFor(P1, { histories: new Map([[10, short]]) }), window));
    expect(report.operatingHours).toBeCloseTo(172, 12);
    expect(report.operatingTime.unknownHours).toBeCloseTo(48, 12);
    expect(report.notes).toContain('T1.RUN has run-status data from 2024-12-01T00:00:00.000Z to 2025-01-09T00:00:00.000Z: 48 h of the window are of unknown state and not counted.');
  });

  it(`cuts the work orders of the provenance at ${PROVENANCE_CAP} and says so (docs/design.md §6)`, () => {
    const many = Array.from({ length: PROVENANCE_CAP + 1 }, (_, i) =>
      order({ woNumber: `F-${String(i).padStart(4, '0')}`, assetId: 2, failureCode: 'SEAL', reportedAt: at('2025-01-02T00:00:00Z') }),
    );
    const report = checkedAgainstSchema(buildReliabilityReport(inputFor(P1, { workOrders: many }), window));
    expect(report.failures).toBe(PROVENANCE_CAP + 1);
    expect(report.provenance.workOrders).toHaveLength(PROVENANCE_CAP);
    expect(report.notes.at(-1)).toBe(`Provenance lists the first ${PROVENANCE_CAP} of 1,001 work orders.`);
  });
});
