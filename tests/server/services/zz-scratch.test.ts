import { it } from 'vitest';
import { performanceQuerySchema } from '#shared/schemas/kpi-ops.ts';
import { getPerformance } from '#server/services/performance.ts';
import { createTestDatabase } from '../../setup/db.ts';
import { seedOpsPlant } from './ops-plant.ts';
it('prints', async () => {
  const t = await createTestDatabase();
  await seedOpsPlant(t.db);
  const r = await getPerformance(t.db, performanceQuerySchema.parse({ from: '2025-01-01T00:00:00Z', to: '2025-01-08T00:00:00Z' }));
  for (const s of r.stages) console.log(s.asset, s.reason, s.baseline?.time, s.baseline?.reason, s.resets, s.notes, s.points.map(p => [p.state.time.slice(5,10), p.runningHours, p.normalized.permeateFlowChangePct?.toFixed(3), p.normalized.saltPassageChangePct.toFixed(3), p.normalized.differentialPressureChangePct.toFixed(3)]), s.alerts.map(a => [a.kind, a.changePct, a.since]));
  console.log(r.provenance);
  await t.close();
});
