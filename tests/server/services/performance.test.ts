// Performance service on the invented plant of ops-plant.ts (importers + `osmia refresh`).
// Expected normalized changes are worked again here, independently of shared/kpi/performance.ts, from the
// ASTM D4516 structure (normalized flow = Qp · NDPref/NDP · TCF/TCFref; NDP = Pf − ΔP/2 − Pp − (πfb − πp);
// log-mean feed-brine concentration Cf·ln(1/(1−Y))/Y), with the common-practice constants of docs/design.md §6:
// TDS = 0.67 × conductivity and 1 psi (0.0689475729 bar) per 100 mg/L TDS.
import { beforeFreshnessSchema } from '#shared/schemas/common.ts';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { maintenanceCautions } from '#shared/cautions.ts';
import { performanceQuerySchema, performanceReportSchema } from '#shared/schemas/performance.ts';
import { getPerformance } from '#server/services/performance.ts';
import { updateSettings } from '#server/services/settings.ts';
import { createTestDatabase, type TestDatabase } from '../../setup/db.ts';
import { SITE, seedEmptySite, seedOpsPlant, stageBase } from '../../fixtures/ops-plant.ts';
import { getSettings } from '#server/services/settings.ts';

let t: TestDatabase;
beforeAll(async () => {
  t = await createTestDatabase();
  await seedOpsPlant(t.db);
  await seedEmptySite(t.db);
});
afterAll(() => t.close());

const run = async (q: Record<string, unknown>) =>
  getPerformance(t.db, performanceQuerySchema.parse({ site: SITE, from: '2025-01-01T00:00:00Z', to: '2025-01-11T00:00:00Z', ...q }), await getSettings(t.db));

/** Net driving pressure, bar, of an operating point (ASTM D4516 structure, log-mean average; common-practice constants). */
function ndp(p: { pf: number; pc: number; pp: number; qf: number; qp: number; cf: number; cp: number }): number {
  const y = p.qp / p.qf;
  const cfb = 0.67 * p.cf * (Math.log(1 / (1 - y)) / y);
  const bar = 0.0689475729 / 100;
  return p.pf - (p.pf - p.pc) / 2 - p.pp - (cfb * bar - 0.67 * p.cp * bar);
}

describe('a stage at constant conditions', () => {
  it('shows a 0 % change on every day, from the days the train ran throughout', async () => {
    const report = beforeFreshnessSchema(performanceReportSchema).parse(await run({ asset: 'TR1-S1', detail: 'full' }));
    expect(report.stages.map((s) => s.asset)).toEqual(['TR1-S1']);
    const stage = report.stages[0]!;
    expect(stage.train).toBe('TR1');
    // Ten days of data (Jan 1–10); the stop hours (readings collapse to near zero) and the bad-quality spike
    // of 999 m³/h must not reach the means, or these would not be exactly the constant values.
    expect(stage.points).toHaveLength(10);
    for (const p of stage.points) {
      expect(p.state.permeateFlowM3h).toBeCloseTo(stageBase.qp, 12);
      expect(p.state.recovery).toBeCloseTo(0.25, 12);
      expect(p.state.measuredConcentrateFlowM3h).toBeCloseTo(30, 12);
      expect(p.normalized.permeateFlowChangePct).toBeCloseTo(0, 10);
      expect(p.normalized.saltPassageChangePct).toBeCloseTo(0, 10);
      expect(p.normalized.differentialPressureChangePct).toBeCloseTo(0, 10);
    }
    expect(stage.latest!.state.netDrivingPressureBar).toBeCloseTo(ndp(stageBase), 10);
    // The default summary keeps the charted figures of each point and leaves the intermediates out.
    const summary = beforeFreshnessSchema(performanceReportSchema).parse(await run({ asset: 'TR1-S1' })).stages[0]!.points[0]!;
    expect(summary.normalized.permeateFlowM3h).toBeCloseTo(stage.points[0]!.normalized.permeateFlowM3h!, 3);
    expect(summary.state.measuredConcentrateFlowM3h).toBeUndefined();
    expect(summary.normalized.permeateFlowChangePct).toBeCloseTo(0, 10);
    expect(stage.alerts).toEqual([]);
  });

  it('averages only the hours the train ran the whole hour', async () => {
    const report = await run({ asset: 'TR1-S1' });
    // Jan 3: stopped 06:00–18:00 → 12 running hours; Jan 7: stopped 00:00–08:00 → 16.
    expect(report.stages[0]!.points.map((p) => [p.state.time.slice(0, 10), p.runningHours])).toEqual([
      ['2025-01-01', 24],
      ['2025-01-02', 24],
      ['2025-01-03', 12],
      ['2025-01-04', 24],
      ['2025-01-05', 24],
      ['2025-01-06', 24],
      ['2025-01-07', 16],
      ['2025-01-08', 24],
      ['2025-01-09', 24],
      ['2025-01-10', 24],
    ]);
  });

  it('keeps the baseline through a single element swap, and the initial fill is no change', async () => {
    const stage = (await run({ asset: 'TR1-S1' })).stages[0]!;
    // A-007 replaced A-001 on Jan 4 10:00: 1 of the stage's 6 positions (17 %), below the 20 % change-out
    // default, so the baseline stays the first running day; the initial fill of Dec 31 is no change either.
    expect(stage.baseline).toMatchObject({ time: '2025-01-01T00:00:00.000Z', reason: 'first-running-day', resetAt: null });
    expect(stage.baseline!.setBy).toEqual({ kind: 'first-running-day', at: null, workOrder: null, elements: null });
    expect(stage.resets).toEqual([]);
  });

  it('moves the baseline to the first day after a change-out of the set share, and says so', async () => {
    await updateSettings(t.db, { baselineChangeOutSharePct: 15 }, 'test');
    try {
      const stage = (await run({ asset: 'TR1-S1' })).stages[0]!;
      // Now 1 of 6 (17 %) reaches the share: the first day starting after Jan 4 10:00 is Jan 5.
      expect(stage.baseline).toMatchObject({ time: '2025-01-05T00:00:00.000Z', reason: 'after-reset', resetAt: '2025-01-04T10:00:00.000Z' });
      expect(stage.baseline!.setBy).toEqual({ kind: 'element-change-out', at: '2025-01-04T10:00:00.000Z', workOrder: null, elements: 1 });
      expect(stage.resets).toEqual(['2025-01-04T10:00:00.000Z']);
    } finally {
      await updateSettings(t.db, { baselineChangeOutSharePct: 20 }, 'test');
    }
  });

  it('takes the baseline from before the window when the window starts later', async () => {
    const stage = (await run({ asset: 'TR1-S1', from: '2025-01-06T00:00:00Z' })).stages[0]!;
    // No reset: the baseline is still the first running day of the data, Jan 1, outside the window; the
    // points are the window's own days only.
    expect(stage.baseline).toMatchObject({ time: '2025-01-01T00:00:00.000Z', reason: 'first-running-day', index: 0 });
    expect(stage.points[0]!.state.time).toBe('2025-01-06T00:00:00.000Z');
    expect(stage.points.every((p) => p.normalized.permeateFlowChangePct !== null && Math.abs(p.normalized.permeateFlowChangePct) < 1e-9)).toBe(true);
  });
});

describe('a stage with a planted 12 % permeate flow drop at equal temperature and pressures', () => {
  it('fires the flow alert, with its cautions', async () => {
    const report = beforeFreshnessSchema(performanceReportSchema).parse(await run({ asset: 'TR1-S2', to: '2025-01-08T00:00:00Z' }));
    const stage = report.stages[0]!;
    // The initial fill of TR1-S2 on Jan 1 02:00 (first day of data) is not an element change.
    expect(stage.baseline).toMatchObject({ time: '2025-01-01T00:00:00.000Z', reason: 'first-running-day', resetAt: null });
    expect(stage.resets).toEqual([]);
    // Qp 10 → 8.8 m³/h at Qf 40: recovery 0.25 → 0.22 changes the feed-brine osmotic pressure slightly, so
    // the normalized change is 100·(0.88 · NDPref/NDP − 1) ≈ −12.08 %, not exactly −12 %.
    const after = { ...stageBase, qp: 8.8 };
    const expected = 100 * ((8.8 / 10) * (ndp(stageBase) / ndp(after)) - 1);
    expect(expected).toBeCloseTo(-12.083, 3);
    expect(stage.latest!.normalized.permeateFlowChangePct).toBeCloseTo(expected, 9);
    expect(stage.alerts.map((a) => a.kind)).toEqual(['permeate-flow-drop']);
    const alert = stage.alerts[0]!;
    expect(alert).toMatchObject({ since: '2025-01-06T00:00:00.000Z', time: '2025-01-07T00:00:00.000Z', thresholdPct: 10 });
    expect(alert.changePct).toBeCloseTo(expected, 9);
    expect(alert.cautions).toEqual([...maintenanceCautions]);
  });

  it('starts a new baseline after the clean-in-place, and the alert clears', async () => {
    const stage = (await run({ asset: 'TR1-S2' })).stages[0]!;
    // WO-8 (preventive, "Clean-in-place …") ends its out-of-service window on Jan 8 12:00 → baseline Jan 9.
    expect(stage.baseline).toMatchObject({ time: '2025-01-09T00:00:00.000Z', reason: 'after-reset', resetAt: '2025-01-08T12:00:00.000Z' });
    expect(stage.baseline!.setBy).toEqual({ kind: 'cleaning', at: '2025-01-08T12:00:00.000Z', workOrder: 'WO-8', elements: null });
    expect(stage.latest!.normalized.permeateFlowChangePct).toBeCloseTo(0, 10);
    expect(stage.alerts).toEqual([]);
  });

  it('uses the alert threshold setting', async () => {
    await updateSettings(t.db, { alertFlowDropPct: 15 }, 'test');
    try {
      const stage = (await run({ asset: 'TR1-S2', to: '2025-01-08T00:00:00Z' })).stages[0]!;
      expect(stage.settings.flowDropPct).toBe(15);
      expect(stage.alerts).toEqual([]);
    } finally {
      await updateSettings(t.db, { alertFlowDropPct: 10 }, 'test');
    }
  });
});

describe('edges', () => {
  it('returns a stage without its needed tags with null figures and the missing quantities', async () => {
    const answer = await run({ asset: 'TR2' });
    const report = beforeFreshnessSchema(performanceReportSchema).parse(answer);
    const stage = answer.stages[0]!;
    expect(report.stages[0]).toMatchObject({ asset: 'TR2-S1', baseline: null, latest: null, points: [], alerts: [] });
    expect(stage.missingQuantities).toEqual([
      'concentrate_pressure',
      'permeate_pressure',
      'feed_flow',
      'permeate_flow',
      'feed_conductivity',
      'permeate_conductivity',
      'feed_temperature',
    ]);
    expect(stage.reason).toMatch(/TR2-S1 has no tag for concentrate_pressure, permeate_pressure, .*feed_temperature/);
    expect(stage.reason).toMatch(/run-status tag/);
  });

  it('lists every stage of a train', async () => {
    expect((await run({ asset: 'TR1' })).stages.map((s) => s.asset)).toEqual(['TR1-S1', 'TR1-S2']);
  });

  it('answers a window without running data with no baseline, and says so', async () => {
    const stage = beforeFreshnessSchema(performanceReportSchema).parse(await run({ asset: 'TR1-S1', from: '2024-06-01', to: '2024-07-01' })).stages[0]!;
    expect(stage.baseline).toBeNull();
    expect(stage.points).toEqual([]);
    expect(stage.notes.join(' ')).toMatch(/No running data in the window/);
  });

  it('answers a site without data', async () => {
    const report = beforeFreshnessSchema(performanceReportSchema).parse(await getPerformance(t.db, performanceQuerySchema.parse({ site: 'EMPTY' }), await getSettings(t.db)));
    expect(report).toMatchObject({ from: null, to: null, stages: [] });
  });

  it('refuses an asset that is neither a train nor a stage, and an empty window', async () => {
    await expect(run({ asset: 'TR1-HPP' })).rejects.toMatchObject({ status: 400, code: 'bad-request' });
    await expect(run({ from: '2025-01-02', to: '2025-01-02' })).rejects.toMatchObject({ status: 400, code: 'invalid-window' });
  });
});
