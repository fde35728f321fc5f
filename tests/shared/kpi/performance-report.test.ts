// buildPerformanceReport (shared/kpi/performance-report.ts) on a hand-worked invented train, without a database.
// Rules: docs/design.md §6 (Membrane performance: daily points of hours the train ran throughout, baseline the
// first running day or the first after the last cleaning or change-out — 20 % of the positions within 7 days,
// a single swap leaves it alone, common practice — alerts at −10 % flow, +15 % ΔP, +5 % salt passage, common
// practice). Normalized permeate flow = Qp · (NDP_ref / NDP) · (TCF(T) / TCF(T_ref)) and normalized ΔP =
// ΔP · (Q_avg,ref / Q_avg)^1.5: the structure of ASTM D4516.
import { describe, expect, it } from 'vitest';
import { maintenanceCautions } from '#shared/cautions.ts';
import {
  baselineLookback,
  buildPerformanceReport,
  cleaningDescription,
  performanceSettingsOf,
  stageTags,
  tagsByAsset,
  type DailyMean,
  type PerformanceAsset,
  type PerformanceReportInput,
  type PerformanceStageRows,
  type PerformanceTag,
  type PerformanceWindow,
} from '#shared/kpi/performance-report.ts';
import { beforeFreshnessSchema } from '#shared/schemas/common.ts';
import { performanceReportSchema, performanceStageSchema } from '#shared/schemas/performance.ts';
import { settingsDefaults } from '#shared/schemas/settings.ts';

const t = (iso: string) => new Date(iso);
const d = (date: string) => t(`${date}T00:00:00Z`);

// Train TR with the run-status tag TR.RUN; stage TR-S1 (two vessels of 6 positions: 12) with every needed tag,
// a second feed-pressure tag and a concentrate-flow meter; stage TR-S2 with no tag of its own.
const asset = (id: number, code: string, kind: PerformanceAsset['kind'], parentId: number | null, elementCapacity: number | null = null): PerformanceAsset => ({ id, code, kind, parentId, elementCapacity });
const TR = asset(1, 'TR', 'train', null);
const S1 = asset(2, 'TR-S1', 'stage', 1);
const V1 = asset(3, 'TR-S1-V1', 'vessel', 2, 6);
const V2 = asset(4, 'TR-S1-V2', 'vessel', 2, 6);
const S2 = asset(5, 'TR-S2', 'stage', 1);
const assets = [TR, S1, V1, V2, S2];
const tag = (id: number, name: string, on: PerformanceAsset, quantity: PerformanceTag['quantity']): PerformanceTag => ({ id, name, assetId: on.id, assetCode: on.code, quantity });
// Ordered by name, as the tag register is read.
const tags = [
  tag(11, 'S1.CF', S1, 'feed_conductivity'),
  tag(12, 'S1.CP', S1, 'permeate_conductivity'),
  tag(13, 'S1.PC', S1, 'concentrate_pressure'),
  tag(14, 'S1.PF', S1, 'feed_pressure'),
  tag(15, 'S1.PF2', S1, 'feed_pressure'),
  tag(16, 'S1.PP', S1, 'permeate_pressure'),
  tag(17, 'S1.QC', S1, 'concentrate_flow'),
  tag(18, 'S1.QF', S1, 'feed_flow'),
  tag(19, 'S1.QP', S1, 'permeate_flow'),
  tag(20, 'S1.T', S1, 'feed_temperature'),
  tag(10, 'TR.RUN', TR, 'run_status'),
];

/** The daily means of one day: bar, m³/h, µS/cm, °C; `hours` the hours the train ran throughout. */
function day(date: string, v: { pf: number; pc: number; pp: number; qf: number; qp: number; qc: number; cf: number; cp: number; tempC: number }, hours = 24): DailyMean[] {
  const byTag: [number, number][] = [[11, v.cf], [12, v.cp], [13, v.pc], [14, v.pf], [16, v.pp], [17, v.qc], [18, v.qf], [19, v.qp], [20, v.tempC]];
  // The concentrate meter's own hours do not count toward the day's running hours.
  return byTag.map(([tagId, mean]) => ({ day: d(date), tagId, mean, hours: tagId === 17 ? 1 : hours }));
}
const base = { pf: 12, pc: 11, pp: 0.5, qf: 40, qp: 10, qc: 30, cf: 1000, cp: 10, tempC: 20 };
// From 13 January permeate and feed flow fall 12 % together: recovery, pressures and temperature are unchanged,
// so NDP and TCF are too, and the normalized flow falls by exactly the raw 12 %.
const drop = { ...base, qf: 35.2, qp: 8.8, qc: 26.4 };
// 12 January reads a concentrate pressure above the feed pressure: not an operating point.
const broken = { ...base, pc: 13 };

const window = { from: d('2025-01-10'), to: d('2025-01-15') };
const rows: PerformanceStageRows = {
  days: [...day('2025-01-10', base), ...day('2025-01-11', base, 20), ...day('2025-01-12', broken), ...day('2025-01-13', drop), ...day('2025-01-14', drop)],
  // Read from the change-out of 8 January 10:00: that day's partial bucket starts before it and is not the baseline.
  daysBefore: [...day('2025-01-08', base, 14), ...day('2025-01-09', base)],
  runStatusFrom: t('2025-01-01T00:00:00Z'),
  installs: [
    // The initial fill, on the first day of the run-status data: no change.
    ...['E1', 'E2', 'E3', 'E4'].map((serial, i) => ({ serial, vesselId: i < 2 ? 3 : 4, position: 1 + (i % 2), installedAt: t('2025-01-01T06:00:00Z') })),
    // Three of the 12 positions (25 % ≥ 20 %) within 7 days: a change-out, dated by its last install.
    { serial: 'E5', vesselId: 3, position: 3, installedAt: t('2025-01-07T08:00:00Z') },
    { serial: 'E6', vesselId: 3, position: 4, installedAt: t('2025-01-07T09:00:00Z') },
    { serial: 'E7', vesselId: 4, position: 3, installedAt: t('2025-01-08T10:00:00Z') },
    // A single swap more than 7 days after E5: no change-out of its own.
    { serial: 'E8', vesselId: 4, position: 4, installedAt: t('2025-01-14T12:00:00Z') },
  ],
  preventiveOrders: [
    { woNumber: 'WO-CAN', status: 'cancelled', description: 'CIP', outOfServiceTo: t('2025-01-09T12:00:00Z'), completedAt: null },
    { woNumber: 'WO-CIP', status: 'closed', description: 'Clean-in-place of stage 1', outOfServiceTo: t('2025-01-05T12:00:00Z'), completedAt: t('2025-01-05T14:00:00Z') },
    { woNumber: 'WO-FIL', status: 'closed', description: 'Replace cartridge filters', outOfServiceTo: null, completedAt: t('2025-01-06T10:00:00Z') },
    { woNumber: 'WO-LATE', status: 'open', description: 'Chemical cleaning', outOfServiceTo: null, completedAt: t('2025-01-20T00:00:00Z') },
  ],
};
const input: PerformanceReportInput = { site: 'PLANT', timeZone: 'UTC', assets, inScope: assets, tags, stages: new Map([['TR-S1', rows]]) };
const options = { feedBrineAverage: 'log-mean', viscosityCorrection: false, detail: 'summary' } as const;
const full: PerformanceWindow = { ...window, ...options, detail: 'full' };

const exact = (answer: ReturnType<typeof buildPerformanceReport>) => expect(beforeFreshnessSchema(performanceReportSchema).parse(answer)).toEqual(answer);

describe('buildPerformanceReport', () => {
  const report = buildPerformanceReport(input, full, settingsDefaults);
  const stage = report.stages[0]!;

  it('answers exactly the schema, in both details', () => {
    exact(report);
    exact(buildPerformanceReport(input, { ...window, ...options }, settingsDefaults));
  });

  it('reads each stage from its own tags and its train’s run status, and says which', () => {
    expect(report.stages.map((s) => s.asset)).toEqual(['TR-S1', 'TR-S2']);
    expect(stage).toMatchObject({ train: 'TR', runStatusTag: 'TR.RUN', missingQuantities: [], reason: null });
    // The first tag by name of each quantity; run status first.
    expect(stage.tags).toEqual(['TR.RUN', 'S1.CF', 'S1.CP', 'S1.PC', 'S1.PF', 'S1.PP', 'S1.QC', 'S1.QF', 'S1.QP', 'S1.T']);
    expect(stage.notes).toEqual([
      'Run status from TR.RUN (on TR); daily means of hours the train ran throughout.',
      'Several feed_pressure tags on TR-S1: S1.PF is used, S1.PF2 is not.',
      'The day of 2025-01-12 is left out: point: concentrate pressure (13) exceeds feed pressure (12) bar.',
    ]);
  });

  it('gives one point per running day of the window, with its running hours', () => {
    expect(stage.points.map((p) => [p.state.time, p.runningHours])).toEqual([
      ['2025-01-10T00:00:00.000Z', 24],
      ['2025-01-11T00:00:00.000Z', 20],
      ['2025-01-13T00:00:00.000Z', 24],
      ['2025-01-14T00:00:00.000Z', 24],
    ]);
    expect(stage.points[0]!.state.measuredConcentrateFlowM3h).toBe(30);
  });

  it('takes the baseline from the first running day after the last reset, before the window', () => {
    // Resets: WO-CIP's out-of-service end (5 Jan 12:00; the cancelled CIP, the filter job and the cleaning not done
    // by the window end are not resets) and the change-out of E5–E7 (8 Jan 10:00). The first day after it is 9 Jan.
    expect(stage.resets).toEqual(['2025-01-05T12:00:00.000Z', '2025-01-08T10:00:00.000Z']);
    expect(stage.baseline).toMatchObject({ index: 0, time: '2025-01-09T00:00:00.000Z', reason: 'after-reset', resetAt: '2025-01-08T10:00:00.000Z' });
    expect(stage.baseline!.setBy).toEqual({ kind: 'element-change-out', at: '2025-01-08T10:00:00.000Z', workOrder: null, elements: 3 });
  });

  it('measures each day against it and alerts on the latest', () => {
    const changes = stage.points.map((p) => p.normalized.permeateFlowChangePct!);
    expect(changes[0]).toBeCloseTo(0, 10);
    expect(changes[1]).toBeCloseTo(0, 10);
    // 8.8 / 10 − 1 = −12 %.
    expect(changes[3]).toBeCloseTo(-12, 10);
    // ΔP: Q_avg falls from (40 + 30)/2 = 35 to (35.2 + 26.4)/2 = 30.8 m³/h → (35/30.8)^1.5 − 1 = +21.14 %.
    expect(stage.latest!.normalized.differentialPressureChangePct).toBeCloseTo(100 * ((35 / 30.8) ** 1.5 - 1), 9);
    expect(stage.alerts.map((a) => [a.kind, a.since])).toEqual([
      ['permeate-flow-drop', '2025-01-13T00:00:00.000Z'],
      ['differential-pressure-rise', '2025-01-13T00:00:00.000Z'],
    ]);
    for (const a of stage.alerts) expect(a.cautions).toEqual([...maintenanceCautions]);
  });

  it('keeps the charted figures of each point, to 5 significant digits, unless asked for full detail', () => {
    const summary = buildPerformanceReport(input, { ...window, ...options }, settingsDefaults).stages[0]!.points[3]!;
    expect(Object.keys(summary.state).sort()).toEqual(['tempC', 'time']);
    expect(summary.normalized.permeateFlowChangePct).toBe(Number(stage.points[3]!.normalized.permeateFlowChangePct!.toPrecision(5)));
    expect(summary.runningHours).toBe(24);
    expect(stage.points[3]!.state).toHaveProperty('netDrivingPressureBar');
  });

  it('answers a stage without its tags with no figures and what is missing', () => {
    expect(report.stages[1]).toEqual({
      asset: 'TR-S2',
      train: 'TR',
      baseline: null,
      points: [],
      latest: null,
      alerts: [],
      settings: stage.settings,
      notes: [expect.stringMatching(/^TR-S2 has no tag for feed_pressure, concentrate_pressure, .*feed_temperature: no normalized figures\.$/)],
      resets: [],
      runStatusTag: 'TR.RUN',
      tags: ['TR.RUN'],
      missingQuantities: ['feed_pressure', 'concentrate_pressure', 'permeate_pressure', 'feed_flow', 'permeate_flow', 'feed_conductivity', 'permeate_conductivity', 'feed_temperature'],
      reason: report.stages[1]!.notes[0],
    });
  });

  it('gives as provenance the tags, the cleanings and the serials of the change-outs', () => {
    expect(report.provenance).toEqual({
      workOrders: ['WO-CIP'],
      tags: stage.tags,
      windows: [{ from: '2025-01-10T00:00:00.000Z', to: '2025-01-15T00:00:00.000Z', what: 'window' }],
      elements: ['E5', 'E6', 'E7'],
    });
    expect(report.notes).toEqual([]);
  });

  it('uses the plant’s thresholds and the query’s variants', () => {
    const settings = performanceSettingsOf({ ...settingsDefaults, alertFlowDropPct: 15, alertDpRisePct: 25 }, { feedBrineAverage: 'arithmetic', viscosityCorrection: true });
    expect(settings).toMatchObject({ flowDropPct: 15, dpRisePct: 25, feedBrineAverage: 'arithmetic', dpViscosityCorrection: true, tdsFactor: 0.67 });
    const quiet = buildPerformanceReport(input, full, { ...settingsDefaults, alertFlowDropPct: 15, alertDpRisePct: 25 }).stages[0]!;
    expect(quiet.alerts).toEqual([]);
  });
});

describe('baselineLookback', () => {
  const plan = stageTags(S1, assets, tagsByAsset(tags));
  const look = (r: PerformanceStageRows, w: { from: Date; to: Date }) => baselineLookback(S1, assets, plan, r, w, 'UTC', settingsDefaults, options);

  it('reads from the last reset before the window, for at most 30 days and never into it', () => {
    expect(look({ ...rows, daysBefore: [] }, window)).toEqual({ from: t('2025-01-08T10:00:00Z'), to: d('2025-01-10') });
    // Without resets, from the start of the run-status data: 1 Jan + 30 d = 31 Jan, before a window from 1 March.
    const plain = { ...rows, installs: [], preventiveOrders: [] };
    expect(look(plain, { from: d('2025-03-01'), to: d('2025-03-05') })).toEqual({ from: t('2025-01-01T00:00:00Z'), to: d('2025-01-31') });
  });

  it('reads nothing when a reset in the window comes before its first running day, or nothing comes before the window', () => {
    // From 12 Jan: that day is left out, so the first running day is 13 Jan; a cleaning ending 12 Jan 06:00 comes first.
    const cleanedInWindow = { ...rows, preventiveOrders: [...rows.preventiveOrders, { woNumber: 'WO-IN', status: 'closed' as const, description: 'CIP', outOfServiceTo: t('2025-01-12T06:00:00Z'), completedAt: null }] };
    const fromTwelfth = { ...cleanedInWindow, days: rows.days.filter((r) => r.day >= d('2025-01-12')) };
    expect(look(fromTwelfth, { from: d('2025-01-12'), to: window.to })).toBeNull();
    // A cleaning after the first running day does not stop the look back.
    expect(look(cleanedInWindow, window)).not.toBeNull();
    expect(look({ ...rows, runStatusFrom: d('2025-01-10'), installs: [], preventiveOrders: [] }, window)).toBeNull();
  });
});

describe('degenerate input', () => {
  it('no window: every stage empty, and why', () => {
    const empty: PerformanceReportInput = { ...input, tags: [], stages: new Map() };
    const r = buildPerformanceReport(empty, { from: null, to: null, ...options }, settingsDefaults);
    exact(r);
    expect(r).toMatchObject({ from: null, to: null, provenance: { workOrders: [], tags: [], windows: [], elements: [] } });
    expect(r.stages.map((s) => [s.asset, s.reason, s.runStatusTag])).toEqual([
      ['TR-S1', 'No data in the window.', null],
      ['TR-S2', 'No data in the window.', null],
    ]);
    expect(r.notes).toEqual(['Site PLANT has no data to bound a window: give from and to, or import data first.']);
  });

  it('no stage in scope, or no running day in the window', () => {
    expect(buildPerformanceReport({ ...input, inScope: [TR] }, full, settingsDefaults).notes).toEqual(["No asset of kind 'stage' in scope: nothing to normalize."]);
    const idle = { days: [], daysBefore: [], runStatusFrom: null, installs: [], preventiveOrders: [] };
    const r = buildPerformanceReport({ ...input, inScope: [S1], stages: new Map([['TR-S1', idle]]) }, full, settingsDefaults);
    exact(r);
    expect(r.stages[0]).toMatchObject({ baseline: null, points: [], latest: null, alerts: [] });
    expect(r.stages[0]!.notes).toContain('No running data in the window: nothing to normalize.');
  });

  it('refuses input without the rows of a stage whose tags are complete', () => {
    expect(() => buildPerformanceReport({ ...input, stages: new Map() }, full, settingsDefaults)).toThrow(/no rows for stage TR-S1/);
  });
});

describe('the stage answer schema', () => {
  const stage = buildPerformanceReport(input, full, settingsDefaults).stages[0]!;

  it('refuses an alert without cautions (docs/design.md §9)', () => {
    expect(performanceStageSchema.safeParse(stage).success).toBe(true);
    expect(performanceStageSchema.safeParse({ ...stage, alerts: stage.alerts.map((a) => ({ ...a, cautions: [] })) }).success).toBe(false);
  });
});

describe('what counts as a cleaning (docs/design.md §6: clean-in-place, CIP or cleaning)', () => {
  it.each([
    ['Clean-in-place of stage 2', true],
    ['clean in place, caustic', true],
    ['CIP after flow loss', true],
    ['Chemical cleaning', true],
    ['Replace cartridge filters', false],
    ['Inspect the CIPHER valve', false],
  ])('%s → %s', (description, expected) => {
    expect(cleaningDescription.test(description)).toBe(expected);
  });
});
