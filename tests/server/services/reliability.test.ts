// Reliability service on the invented plant of ops-plant.ts, loaded through the importers and `osmia refresh`.
// Every expected figure is worked by hand from the plant's description; chi-square quantiles come from jstat
// (a reference library) and the bound formulas from NIST/SEMATECH e-Handbook of Statistical Methods §8.4.5.1
// (time-terminated two-sided bounds: lower 2T/χ²(1−α/2; 2r+2), upper 2T/χ²(α/2; 2r); zero failures: T/(−ln(α/2))).
import { beforeFreshnessSchema } from '#shared/schemas/common.ts';
import jstat from 'jstat';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { reliabilityQuerySchema, reliabilityReportSchema } from '#shared/schemas/reliability.ts';
import { HttpError } from '#server/errors.ts';
import { getReliability } from '#server/services/reliability.ts';
import { createTestDatabase, type TestDatabase } from '../../setup/db.ts';
import { SITE, seedEmptySite, seedOpsPlant } from '../../fixtures/ops-plant.ts';

let t: TestDatabase;
beforeAll(async () => {
  t = await createTestDatabase();
  await seedOpsPlant(t.db);
  await seedEmptySite(t.db);
});
afterAll(() => t.close());

const window = { from: '2025-01-01T00:00:00Z', to: '2025-01-11T00:00:00Z' };
const run = (q: Record<string, unknown>) => getReliability(t.db, reliabilityQuerySchema.parse({ site: SITE, ...window, ...q }));
const chi2 = (p: number, dof: number) => jstat.jStat.chisquare.inv(p, dof);

describe('reliability of a pump with two failures over a known running time', () => {
  it('gives MTBF = T/r with the handbook bounds, MTTR with the completed − reported fallback, and both availabilities', async () => {
    const report = await run({ asset: 'TR1-HPP' });
    expect(beforeFreshnessSchema(reliabilityReportSchema).parse(report)).toBeTruthy();
    // T: TR1.RUN (the pump's train) covers the whole window, 240 h, stopped 12 h + 8 h → 220 h running.
    expect(report.operatingTimeSource).toBe('ancestor-run-status');
    expect(report.operatingHours).toBeCloseTo(220, 9);
    // r: WO-1 and WO-2 (WO-3 cancelled, WO-5 has no failure code, WO-9 before the window).
    expect(report.failures).toBe(2);
    expect(report.mtbfHours).toBeCloseTo(110, 9);
    // NIST/SEMATECH §8.4.5.1, α = 0.1: lower 2·220/χ²(0.95; 6) ≈ 440/12.592 = 34.94 h, upper 440/χ²(0.05; 4) ≈ 440/0.7107 = 619.1 h.
    expect(report.mtbfLowerHours).toBeCloseTo(440 / chi2(0.95, 6), 9);
    expect(report.mtbfUpperHours).toBeCloseTo(440 / chi2(0.05, 4), 9);
    expect(report.mtbfLowerHours).toBeCloseTo(34.94, 2);
    expect(report.mtbfUpperHours).toBeCloseTo(619.08, 1);
    // MTTR: WO-1 out of service 06:00–18:00 = 12 h; WO-2 has no window → completed − reported = 6 h; (12 + 6)/2 = 9 h.
    expect(report.mttrHours).toBeCloseTo(9, 9);
    expect(report.mttrBasis).toEqual({ outOfServiceWindow: 1, completedLessReported: 1, unknown: 0 });
    expect(report.notes).toContain('1 of 2 failures has no out-of-service window: its restoration time is completed − reported.');
    // Active repair: WO-1 07:00–15:00 = 8 h, WO-2 02:00–06:00 = 4 h → 6 h.
    expect(report.meanActiveRepairHours).toBeCloseTo(6, 9);
    // Inherent 110/(110 + 9); operational 220/(220 + 20).
    expect(report.availability).toBeCloseTo(110 / 119, 12);
    expect(report.operationalAvailability).toBeCloseTo(220 / 240, 12);
    expect(report.scope).toEqual(['TR1-HPP']);
    expect(report.provenance.workOrders.sort()).toEqual(['WO-1', 'WO-2']);
    expect(report.provenance.tags).toEqual(['TR1.RUN']);
    expect(report.provenance.windows).toContainEqual({ from: '2025-01-01T00:00:00.000Z', to: '2025-01-11T00:00:00.000Z', what: 'window' });
    expect(report.provenance.windows).toContainEqual({ from: '2025-01-03T06:00:00.000Z', to: '2025-01-03T18:00:00.000Z', what: 'out of service WO-1' });
  });

  it('changes the bounds, not the estimate, with the confidence level', async () => {
    const report = await run({ asset: 'TR1-HPP', confidence: '0.95' });
    expect(report.confidence).toBe(0.95);
    expect(report.mtbfHours).toBeCloseTo(110, 9);
    // NIST/SEMATECH §8.4.5.1 with α = 0.05.
    expect(report.mtbfLowerHours).toBeCloseTo(440 / chi2(0.975, 6), 9);
    expect(report.mtbfUpperHours).toBeCloseTo(440 / chi2(0.025, 4), 9);
  });

  it('counts the failures of everything below a train against the train’s own run status', async () => {
    const report = await run({ asset: 'TR1' });
    expect(report.operatingTimeSource).toBe('run-status');
    expect(report.failures).toBe(2);
    expect(report.scope).toEqual(expect.arrayContaining(['TR1', 'TR1-S1', 'TR1-S1-V01', 'TR1-S2', 'TR1-S2-V01', 'TR1-HPP']));
    expect(report.scope).toHaveLength(6);
    expect(report.mtbfHours).toBeCloseTo(110, 9);
  });

  it('places failures by reported_at: the default window (all data) also holds WO-9 of December', async () => {
    const report = await getReliability(t.db, reliabilityQuerySchema.parse({ site: SITE, asset: 'TR1-HPP' }));
    expect(report.from).toBe('2024-12-20T00:00:00.000Z');
    expect(report.failures).toBe(3);
    // Run-status data starts on Jan 1 and ends with the last sample at Jan 11 00:00: still 220 h running, the rest unknown.
    expect(report.operatingHours).toBeCloseTo(220, 9);
    expect(report.operatingTime.unknownHours).toBeGreaterThan(12 * 24);
    expect(report.mtbfHours).toBeCloseTo(220 / 3, 9);
    expect(report.notes.join(' ')).toMatch(/unknown state and not counted/);
  });
});

describe('zero failures', () => {
  it('gives the handbook zero-failure lower bound only, and says why the rest is null', async () => {
    const report = await run({ asset: 'TR1-S1' });
    expect(report.failures).toBe(0);
    expect(report.operatingHours).toBeCloseTo(220, 9);
    expect(report.mtbfHours).toBeNull();
    expect(report.mtbfUpperHours).toBeNull();
    // NIST/SEMATECH §8.4.5.1: 2T/χ²(0.95; 2) = T/(−ln 0.05) = 220/2.9957 = 73.44 h.
    expect(report.mtbfLowerHours).toBeCloseTo((2 * 220) / chi2(0.95, 2), 9);
    expect(report.mtbfLowerHours).toBeCloseTo(220 / -Math.log(0.05), 9);
    expect(report.reasons).toMatchObject({ mtbfHours: 'no-failures', mtbfUpperHours: 'no-failures', mttrHours: 'no-failures', availability: 'no-failures' });
    expect(report.reasons?.mtbfLowerHours).toBeUndefined();
    expect(report.notes.join(' ')).toMatch(/No failures in the window.*one-sided confidence 0\.95/);
    expect(report.operationalAvailability).toBeCloseTo(220 / 240, 12);
  });
});

describe('no run-status tag: the calendar fallback', () => {
  it('uses calendar time less the union of out-of-service windows, and names the fallback', async () => {
    const report = await run({ asset: 'TR2' });
    expect(beforeFreshnessSchema(reliabilityReportSchema).parse(report).operatingTimeSource).toBe('calendar-less-out-of-service');
    // 240 h less WO-6 (Jan 5 00–10) ∪ WO-7 (Jan 5 08–14) = 14 h → 226 h; one failure (WO-6, MOTOR).
    expect(report.operatingHours).toBeCloseTo(226, 9);
    expect(report.failures).toBe(1);
    expect(report.mtbfHours).toBeCloseTo(226, 9);
    expect(report.mtbfLowerHours).toBeCloseTo(452 / chi2(0.95, 4), 9);
    expect(report.mtbfUpperHours).toBeCloseTo(452 / chi2(0.05, 2), 9);
    expect(report.mttrHours).toBeCloseTo(10, 9);
    expect(report.meanActiveRepairHours).toBeCloseTo(8, 9);
    expect(report.operationalAvailability).toBeCloseTo(226 / 240, 12);
    expect(report.provenance.workOrders.sort()).toEqual(['WO-6', 'WO-7']);
    expect(report.provenance.tags).toEqual([]);
    expect(report.notes.join(' ')).toMatch(/TR2 and its ancestors have no run-status tag/);
  });

  it('sums the site’s top-level assets and gives the weakest source of the sum', async () => {
    const report = await run({});
    expect(report.asset).toBeNull();
    // TR1 220 h (run status) + TR2 226 h (calendar); failures WO-1, WO-2, WO-6.
    expect(report.operatingHours).toBeCloseTo(446, 9);
    expect(report.failures).toBe(3);
    expect(report.operatingTimeSource).toBe('calendar-less-out-of-service');
    expect(report.operatingTime.units).toEqual([
      { asset: 'TR1', source: 'run-status', tag: 'TR1.RUN', hours: expect.closeTo(220, 9) },
      { asset: 'TR2', source: 'calendar-less-out-of-service', tag: null, hours: expect.closeTo(226, 9) },
    ]);
  });
});

describe('groups', () => {
  it('by asset: one group per asset with failures or a run-status tag, each over its own subtree', async () => {
    const report = await run({ asset: 'TR1', groupBy: 'asset' });
    expect(beforeFreshnessSchema(reliabilityReportSchema).parse(report).groups?.map((g) => g.key)).toEqual(['asset=TR1', 'asset=TR1-HPP']);
    const pump = report.groups.find((g) => g.key === 'asset=TR1-HPP')!;
    expect(pump).toMatchObject({ asset: 'TR1-HPP', failures: 2, operatingTimeSource: 'ancestor-run-status' });
    expect(pump.mtbfHours).toBeCloseTo(110, 9);
  });

  it('by kind: failures of the assets of a kind over their pooled operating time', async () => {
    const report = await run({ asset: 'TR1', groupBy: 'kind' });
    expect(report.groups.map((g) => g.key)).toEqual(['kind=pump', 'kind=stage', 'kind=train', 'kind=vessel']);
    const stage = report.groups.find((g) => g.key === 'kind=stage')!;
    // Two stages, each running 220 h (their train's run status), no failures → T = 440 h, lower bound 440/(−ln 0.05).
    expect(stage.operatingHours).toBeCloseTo(440, 9);
    expect(stage.mtbfLowerHours).toBeCloseTo(440 / -Math.log(0.05), 9);
    expect(report.groups.find((g) => g.key === 'kind=pump')).toMatchObject({ failures: 2, mtbfHours: expect.closeTo(110, 9) });
  });
});

describe('edges', () => {
  it('refuses an empty window', async () => {
    await expect(run({ from: '2025-01-05T00:00:00Z', to: '2025-01-05T00:00:00Z' })).rejects.toMatchObject({ status: 400, code: 'invalid-window' });
    await expect(run({ from: '2025-01-05T00:00:00Z', to: '2025-01-04T00:00:00Z' })).rejects.toBeInstanceOf(HttpError);
  });

  it('answers a window without data with no operating time and reasons, not an error', async () => {
    const report = await run({ asset: 'TR1-HPP', from: '2024-06-01T00:00:00Z', to: '2024-07-01T00:00:00Z' });
    expect(beforeFreshnessSchema(reliabilityReportSchema).parse(report)).toBeTruthy();
    expect(report.operatingHours).toBe(0);
    expect(report.failures).toBe(0);
    expect(report.mtbfHours).toBeNull();
    expect(report.mtbfLowerHours).toBeNull();
    expect(report.reasons).toMatchObject({ mtbfHours: 'no-operating-time', mtbfLowerHours: 'no-operating-time', operationalAvailability: 'no-time' });
    expect(report.notes.join(' ')).toMatch(/no good run-status data in the window/);
  });

  it('answers a site without any data with a null window', async () => {
    const report = await getReliability(t.db, reliabilityQuerySchema.parse({ site: 'EMPTY' }));
    expect(beforeFreshnessSchema(reliabilityReportSchema).parse(report)).toMatchObject({ from: null, to: null, operatingHours: 0, failures: 0, mtbfHours: null });
    expect(report.reasons?.mtbfHours).toBe('no-data');
  });

  it('refuses an unknown asset', async () => {
    await expect(run({ asset: 'NOPE' })).rejects.toMatchObject({ status: 404, code: 'asset-not-found' });
  });
});
