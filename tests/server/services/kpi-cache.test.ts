import request from 'supertest';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { reliabilityReportSchema } from '#shared/schemas/kpi.ts';
import { createTestApp, type TestApp } from '../../setup/app.ts';
import { importText, seedPlant } from '../importers/helpers.ts';

let t: TestApp;
beforeAll(async () => {
  t = await createTestApp();
  await seedPlant(t.db);
});
afterAll(() => t.close());

const header = 'wo_number,asset,type,priority,status,failure_code,description,reported_at,started_at,completed_at,out_of_service_from,out_of_service_to,labour_hours,labour_cost,parts_cost,crew';
const failures = async () =>
  reliabilityReportSchema.parse((await request(t.app).get('/api/kpi/reliability?asset=TR1-HPP').set('Cookie', t.cookies.engineer).expect(200)).body).failures;

describe('KPI answers are cached until the data changes', () => {
  it('an import after a read is seen by the next read', async () => {
    await importText(t.db, 'work-orders', `${header}\nWO-C1,TR1-HPP,corrective,high,closed,SEAL-LEAK,x,2026-01-10 08:00,2026-01-10 09:00,2026-01-10 10:00,,,1,1,1,crew-a\n`);
    expect(await failures()).toBe(1);
    expect(await failures()).toBe(1);
    await importText(t.db, 'work-orders', `${header}\nWO-C2,TR1-HPP,corrective,high,closed,BRG-WEAR,x,2026-01-11 08:00,2026-01-11 09:00,2026-01-11 10:00,,,1,1,1,crew-a\n`);
    expect(await failures()).toBe(2);
  });
});
