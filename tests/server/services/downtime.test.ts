// Downtime service on the invented plant of ops-plant.ts (importers + `osmia refresh`). Expected figures are
// worked by hand from the plant's description: stop hours × rated permeate flow (m³/h) × the default water value
// 0.85 per m³ (shared/schemas/settings.ts); Pareto shares are hours / total hours (common practice).
import { beforeFreshnessSchema } from '#shared/schemas/common.ts';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { downtimeQuerySchema, downtimeReportSchema } from '#shared/schemas/downtime.ts';
import { getDowntime } from '#server/services/downtime.ts';
import { updateSettings } from '#server/services/settings.ts';
import { createTestDatabase, type TestDatabase } from '../../setup/db.ts';
import { SITE, seedEmptySite, seedOpsPlant } from '../../fixtures/ops-plant.ts';
import { getSettings } from '#server/services/settings.ts';

let t: TestDatabase;
beforeAll(async () => {
  t = await createTestDatabase();
  await seedOpsPlant(t.db);
  await seedEmptySite(t.db);
});
afterAll(() => t.close());

const run = async (q: Record<string, unknown>) =>
  getDowntime(t.db, downtimeQuerySchema.parse({ site: SITE, from: '2025-01-01T00:00:00Z', to: '2025-01-11T00:00:00Z', ...q }), await getSettings(t.db));

describe('stop events of the whole site', () => {
  it('lists each stop with the keys of docs/design.md §7, planned vs unplanned and its cause', async () => {
    const report = beforeFreshnessSchema(downtimeReportSchema).parse(await run({}));
    expect(report.events.map((e) => [e.asset, e.from, e.to, e.hours, e.planned, e.cause, e.lostVolumeM3])).toEqual([
      // Seal leak: overlaps WO-1 (corrective, SEAL-LEAK) only → unplanned. 12 h × 100 m³/h.
      ['TR1', '2025-01-03T06:00:00.000Z', '2025-01-03T18:00:00.000Z', 12, false, 'SEAL-LEAK', 1200],
      // Motor trip on the pump: WO-6 (MOTOR); WO-7 is preventive but on TR2, above the pump → not planned. 10 h × 50 m³/h (TR2's rating).
      ['TR2-P1', '2025-01-05T00:00:00.000Z', '2025-01-05T10:00:00.000Z', 10, false, 'MOTOR', 500],
      // Calibration on stage TR1-S1 (preventive, below TR1) overlaps → planned; no corrective window → cause unknown.
      ['TR1', '2025-01-07T00:00:00.000Z', '2025-01-07T08:00:00.000Z', 8, true, 'unknown', 800],
      // Still stopped at the last sample (Jan 11 00:00): cut there.
      ['TR2-P1', '2025-01-10T20:00:00.000Z', '2025-01-11T00:00:00.000Z', 4, false, 'unknown', 200],
    ]);
    expect(report.events[2]!.plannedBy).toEqual(['WO-4']);
    expect(report.events[0]!.causeWorkOrder).toBe('WO-1');
    expect(report.events[0]!.cost).toBeCloseTo(1200 * 0.85, 9);
    expect(report.events[3]!.clippedAtEnd).toBe(true);
  });

  it('totals each asset, says whose rating gave the lost volume, and prices it at the water value', async () => {
    const report = await run({});
    expect(report.totals).toEqual([
      { asset: 'TR1', events: 2, hours: 20, plannedHours: 8, unplannedHours: 12, lostVolumeM3: 2000, cost: expect.closeTo(1700, 9), tag: 'TR1.RUN', ratedPermeateM3h: 100, ratedPermeateFrom: 'TR1' },
      { asset: 'TR2-P1', events: 2, hours: 14, plannedHours: 0, unplannedHours: 14, lostVolumeM3: 700, cost: expect.closeTo(595, 9), tag: 'TR2-P1.RUN', ratedPermeateM3h: 50, ratedPermeateFrom: 'TR2' },
    ]);
    expect(report.notes).toContain('TR2-P1 has no rated permeate flow: the 50 m³/h of TR2 is used for its lost volume.');
    expect(report.provenance!.workOrders).toEqual(['WO-1', 'WO-4', 'WO-6']);
    expect(report.provenance!.tags).toEqual(['TR1.RUN', 'TR2-P1.RUN']);
  });

  it('ranks causes and assets by stop hours (Pareto)', async () => {
    const report = await run({});
    // 12 + 10 + 8 + 4 = 34 h; SEAL-LEAK and unknown tie at 12 h (key order), MOTOR 10 h.
    expect(report.paretoByCause.map((r) => [r.key, r.hours, r.events])).toEqual([
      ['SEAL-LEAK', 12, 1],
      ['unknown', 12, 2],
      ['MOTOR', 10, 1],
    ]);
    expect(report.paretoByCause[0]!.share).toBeCloseTo(12 / 34, 12);
    expect(report.paretoByCause[1]!.cumulativeShare).toBeCloseTo(24 / 34, 12);
    expect(report.paretoByAsset.map((r) => [r.key, r.hours])).toEqual([
      ['TR1', 20],
      ['TR2-P1', 14],
    ]);
  });

  it('uses the water value setting', async () => {
    await updateSettings(t.db, { waterValuePerM3: 2 }, 'test');
    try {
      const report = await run({ asset: 'TR1' });
      expect(report.waterValuePerM3).toBe(2);
      expect(report.totals[0]!.cost).toBeCloseTo(4000, 9);
    } finally {
      await updateSettings(t.db, { waterValuePerM3: 0.85 }, 'test');
    }
  });
});

describe('windows and scope', () => {
  it('clips stops to the window and marks them', async () => {
    const report = await run({ from: '2025-01-03T12:00:00Z', to: '2025-01-07T04:00:00Z' });
    expect(report.events.map((e) => [e.asset, e.hours, e.clippedAtStart, e.clippedAtEnd])).toEqual([
      ['TR1', 6, true, false],
      ['TR2-P1', 10, false, false],
      ['TR1', 4, false, true],
    ]);
  });

  it('cuts a stop still open at the end of the data there, even when the window runs on', async () => {
    const report = await run({ asset: 'TR2-P1', to: '2025-01-20T00:00:00Z' });
    expect(report.events.at(-1)).toMatchObject({ from: '2025-01-10T20:00:00.000Z', to: '2025-01-11T00:00:00.000Z', hours: 4, clippedAtEnd: true });
  });

  it('limits the answer to the asset and what is below it', async () => {
    const report = await run({ asset: 'TR2' });
    expect(report.totals.map((r) => r.asset)).toEqual(['TR2-P1']);
    expect(report.events).toHaveLength(2);
  });

  it('answers an asset without a run-status tag with no events and says why', async () => {
    const report = beforeFreshnessSchema(downtimeReportSchema).parse(await run({ asset: 'TR1-HPP' }));
    expect(report.events).toEqual([]);
    expect(report.totals).toEqual([]);
    expect(report.notes).toContain('No asset in scope has a run-status tag: there are no stop events to count.');
  });

  it('answers a window without data with zero totals', async () => {
    const report = beforeFreshnessSchema(downtimeReportSchema).parse(await run({ from: '2024-06-01T00:00:00Z', to: '2024-07-01T00:00:00Z' }));
    expect(report.events).toEqual([]);
    expect(report.totals.map((r) => [r.asset, r.hours])).toEqual([
      ['TR1', 0],
      ['TR2-P1', 0],
    ]);
  });

  it('answers a site without data with an empty window', async () => {
    const report = beforeFreshnessSchema(downtimeReportSchema).parse(await getDowntime(t.db, downtimeQuerySchema.parse({ site: 'EMPTY' }), await getSettings(t.db)));
    expect(report.from).toBe(report.to);
    expect(report.events).toEqual([]);
    expect(report.notes.join(' ')).toMatch(/no data to bound a window/);
  });

  it('refuses an empty window', async () => {
    await expect(run({ from: '2025-01-02T00:00:00Z', to: '2025-01-02T00:00:00Z' })).rejects.toMatchObject({ status: 400, code: 'invalid-window' });
  });
});
