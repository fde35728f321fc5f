// GET /api/kpi/reliability, downtime and performance over HTTP: status, bodies parsed with the shared schemas,
// the hand-worked numbers of the invented plant of tests/fixtures/ops-plant.ts, errors and roles.
import jstat from 'jstat';
import request from 'supertest';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { maintenanceCautions } from '#shared/cautions.ts';
import { errorBodySchema } from '#shared/schemas/error.ts';
import { reliabilityReportSchema } from '#shared/schemas/reliability.ts';
import { downtimeReportSchema } from '#shared/schemas/downtime.ts';
import { performanceReportSchema } from '#shared/schemas/performance.ts';
import { createTestApp, type TestApp } from '../../setup/app.ts';
import { SITE, seedOpsPlant } from '../../fixtures/ops-plant.ts';

let t: TestApp;
beforeAll(async () => {
  t = await createTestApp();
  await seedOpsPlant(t.db);
});
afterAll(() => t.close());

const window = `site=${SITE}&from=2025-01-01T00:00:00Z&to=2025-01-11T00:00:00Z`;
const get = (url: string, role: keyof TestApp['cookies'] = 'engineer') => request(t.app).get(url).set('Cookie', t.cookies[role]);

describe('GET /api/kpi/reliability', () => {
  it('answers the pump: T = 220 h, r = 2, MTBF 110 h with the NIST/SEMATECH §8.4.5.1 bounds', async () => {
    const res = await get(`/api/kpi/reliability?${window}&asset=TR1-HPP`);
    expect(res.status).toBe(200);
    const body = reliabilityReportSchema.parse(res.body);
    expect(body).toMatchObject({ asset: 'TR1-HPP', failures: 2, confidence: 0.9, operatingTimeSource: 'ancestor-run-status' });
    expect(body.operatingHours).toBeCloseTo(220, 9);
    expect(body.mtbfHours).toBeCloseTo(110, 9);
    // NIST/SEMATECH e-Handbook §8.4.5.1, time-terminated, α = 0.1 (quantiles from jstat).
    expect(body.mtbfLowerHours).toBeCloseTo(440 / jstat.jStat.chisquare.inv(0.95, 6), 9);
    expect(body.mtbfUpperHours).toBeCloseTo(440 / jstat.jStat.chisquare.inv(0.05, 4), 9);
    expect(body.mttrHours).toBeCloseTo(9, 9);
  });

  it('names the calendar fallback for a train without a run-status tag', async () => {
    const body = reliabilityReportSchema.parse((await get(`/api/kpi/reliability?${window}&asset=TR2&groupBy=kind`)).body);
    expect(body.operatingTimeSource).toBe('calendar-less-out-of-service');
    expect(body.operatingHours).toBeCloseTo(226, 9);
    expect(body.groups?.map((g) => g.key)).toEqual(['kind=pump', 'kind=stage', 'kind=train']);
  });

  it('refuses an empty window (400), a bad confidence (400) and an unknown asset (404)', async () => {
    const empty = await get(`/api/kpi/reliability?site=${SITE}&from=2025-01-02&to=2025-01-02`);
    expect(empty.status).toBe(400);
    expect(errorBodySchema.parse(empty.body).error.code).toBe('invalid-window');
    expect((await get(`/api/kpi/reliability?${window}&confidence=1.5`)).status).toBe(400);
    const unknown = await get(`/api/kpi/reliability?${window}&asset=NOPE`);
    expect(unknown.status).toBe(404);
    expect(errorBodySchema.parse(unknown.body).error.code).toBe('asset-not-found');
  });

  it('is not for finance (403) and needs a session (401)', async () => {
    expect((await get(`/api/kpi/reliability?${window}`, 'finance')).status).toBe(403);
    expect((await request(t.app).get(`/api/kpi/reliability?${window}`)).status).toBe(401);
  });
});

describe('GET /api/kpi/downtime', () => {
  it('answers events and totals with the keys of docs/design.md §7; finance may read it', async () => {
    const res = await get(`/api/kpi/downtime?${window}`, 'finance');
    expect(res.status).toBe(200);
    const body = downtimeReportSchema.parse(res.body);
    expect(body.events.map((e) => [e.asset, e.hours, e.planned, e.cause])).toEqual([
      ['TR1', 12, false, 'SEAL-LEAK'],
      ['TR2-P1', 10, false, 'MOTOR'],
      ['TR1', 8, true, 'unknown'],
      ['TR2-P1', 4, false, 'unknown'],
    ]);
    // 20 h × 100 m³/h × 0.85 per m³ (default water value).
    expect(body.totals[0]).toMatchObject({ asset: 'TR1', events: 2, hours: 20, plannedHours: 8, unplannedHours: 12, lostVolumeM3: 2000 });
    expect(body.totals[0]!.cost).toBeCloseTo(1700, 9);
    expect(body.paretoByCause[0]!.key).toBe('SEAL-LEAK');
  });
});

describe('GET /api/kpi/performance', () => {
  it('answers each stage of the train; the planted flow drop raises the flow alert with its cautions', async () => {
    const res = await get(`/api/kpi/performance?site=${SITE}&asset=TR1&from=2025-01-01&to=2025-01-08`);
    expect(res.status).toBe(200);
    const body = performanceReportSchema.parse(res.body);
    expect(body.stages.map((s) => [s.asset, s.alerts.map((a) => a.kind)])).toEqual([
      ['TR1-S1', []],
      ['TR1-S2', ['permeate-flow-drop']],
    ]);
    expect(body.stages[1]!.alerts[0]!.cautions).toEqual([...maintenanceCautions]);
    expect(body.stages[1]!.latest!.normalized.permeateFlowChangePct).toBeCloseTo(-12.083, 3);
  });

  it('accepts the arithmetic feed-brine average and the viscosity variant; refuses a pump (400)', async () => {
    const res = await get(`/api/kpi/performance?site=${SITE}&asset=TR1-S1&feedBrineAverage=arithmetic&viscosityCorrection=true`);
    expect(res.status).toBe(200);
    const stage = performanceReportSchema.parse(res.body).stages[0]!;
    expect(stage.settings).toMatchObject({ feedBrineAverage: 'arithmetic', dpViscosityCorrection: true });
    const pump = await get(`/api/kpi/performance?site=${SITE}&asset=TR1-HPP`);
    expect(pump.status).toBe(400);
    expect(errorBodySchema.parse(pump.body).error.code).toBe('bad-request');
  });

  it('is not for finance (403)', async () => {
    expect((await get(`/api/kpi/performance?site=${SITE}`, 'finance')).status).toBe(403);
  });
});
