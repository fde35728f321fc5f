import { createDb } from '#server/db/client.ts';
import { getPerformance } from '#server/services/performance.ts';
import { getReliability } from '#server/services/reliability.ts';
import { getDowntime } from '#server/services/downtime.ts';
import { performanceQuerySchema, downtimeQuerySchema } from '#shared/schemas/kpi-ops.ts';
import { reliabilityQuerySchema } from '#shared/schemas/kpi.ts';
const db = createDb(process.argv[2]);
for (let i = 0; i < 3; i++) {
  let t = performance.now();
  await getPerformance(db, performanceQuerySchema.parse({}));
  const p = performance.now() - t; t = performance.now();
  await getReliability(db, reliabilityQuerySchema.parse({}));
  const r = performance.now() - t; t = performance.now();
  await getDowntime(db, downtimeQuerySchema.parse({}));
  console.log({ performance: p, reliability: r, downtime: performance.now() - t });
}
await db.$client.end();
