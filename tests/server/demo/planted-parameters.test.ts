// On the seeded demo plant, the KPI engine recovers what the generator planted: each stage's element
// Weibull shape and scale, and each pump's failure rate, lie inside the engine's own 90 % intervals.
// The planted values come from the generator's manifest (server/demo/plant.ts), not from this test.
import { mkdtempSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { elementLifeQuerySchema, reliabilityQuerySchema } from '#shared/schemas/kpi.ts';
import { seedDemo, type SeedResult } from '#server/demo/seed.ts';
import { getElementLife } from '#server/services/element-life.ts';
import { getReliability } from '#server/services/reliability.ts';
import { createTestDatabase, type TestDatabase } from '../../setup/db.ts';

let t: TestDatabase;
let seeded: SeedResult;

beforeAll(async () => {
  t = await createTestDatabase();
  // Three years at hourly steps: the element register is the full one (it does not depend on the
  // historian's resolution) and pump failures over three years give each rate some power.
  seeded = await seedDemo(t.db, { outDir: mkdtempSync(join(tmpdir(), 'osmia-planted-')), years: 3, stepMinutes: 60 });
}, 300_000);
afterAll(() => t.close());

describe('planted parameters of the demo plant', () => {
  it('each stage’s Weibull shape and scale lie inside the engine’s 90 % intervals', async () => {
    const report = await getElementLife(t.db, elementLifeQuerySchema.parse({ groupBy: 'stage', confidence: 0.9 }));
    const byStage = seeded.manifest.planted.elementLife.byStage;
    const checked: string[] = [];
    for (const planted of Object.values(byStage)) {
      for (const stage of planted.stages) {
        const group = report.groups.find((g) => g.key === `stage=${stage}`);
        expect(group, `group stage=${stage}`).toBeDefined();
        const w = group!.weibull!;
        expect(w, `fit of ${stage}`).not.toBeNull();
        expect(w.shapeLower!, `${stage} shape lower`).toBeLessThanOrEqual(planted.shape);
        expect(w.shapeUpper!, `${stage} shape upper`).toBeGreaterThanOrEqual(planted.shape);
        expect(w.scaleLowerDays!, `${stage} scale lower`).toBeLessThanOrEqual(planted.scaleDays);
        expect(w.scaleUpperDays!, `${stage} scale upper`).toBeGreaterThanOrEqual(planted.scaleDays);
        checked.push(stage);
      }
    }
    expect(checked.sort()).toEqual(['T1-S1', 'T1-S2', 'T2-S1', 'T2-S2']);
  });

  it('each pump’s planted MTBF lies inside the engine’s 90 % two-sided interval', async () => {
    const historian = seeded.manifest.historian;
    for (const pump of seeded.manifest.planted.pumps) {
      const r = await getReliability(t.db, reliabilityQuerySchema.parse({ asset: pump.asset, from: historian.start, to: historian.end, confidence: 0.9 }));
      expect(r.operatingTimeSource, pump.asset).toBe('run-status');
      expect(r.failures, `${pump.asset} failures`).toBeGreaterThan(0);
      expect(r.mtbfLowerHours!, `${pump.asset} lower`).toBeLessThanOrEqual(pump.mtbfHours);
      expect(r.mtbfUpperHours!, `${pump.asset} upper`).toBeGreaterThanOrEqual(pump.mtbfHours);
    }
  });
});
