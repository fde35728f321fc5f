// GET /api/kpi/<name> (server/routes/kpi.ts) over HTTP: status, bodies parsed with the shared schemas, the
// hand-worked numbers of two small invented plants, errors and roles.
import jstat from 'jstat';
import request from 'supertest';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { maintenanceCautions, vesselWorkCautions } from '#shared/cautions.ts';
import { errorBodySchema } from '#shared/schemas/error.ts';
import { reliabilityReportSchema } from '#shared/schemas/reliability.ts';
import { downtimeReportSchema } from '#shared/schemas/downtime.ts';
import { performanceReportSchema } from '#shared/schemas/performance.ts';
import { createTestApp, type TestApp } from '../../setup/app.ts';
import { SITE, seedOpsPlant } from '../../fixtures/ops-plant.ts';
import { elementLifeReportSchema } from '#shared/schemas/element-life.ts';
import { forecastReportSchema } from '#shared/schemas/forecast.ts';
import { timeToCompleteReportSchema } from '#shared/schemas/time-to-complete.ts';
import { maintenanceMixReportSchema } from '#shared/schemas/maintenance-mix.ts';
import { importText } from '../importers/helpers.ts';

describe('reliability, downtime and performance on the plant of tests/fixtures/ops-plant.ts', () => {
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
});

describe('element life, forecast, time to complete and maintenance mix on a one-vessel plant', () => {
  let t: TestApp;

  beforeAll(async () => {
    t = await createTestApp();
    const site = { site: 'RT' };
    const steps = [
      ['assets', ['code,name,kind,parent,rated_permeate_m3h,element_capacity,rack_row,rack_col', 'T1,Train 1,train,,50,,,', 'T1-S1,Stage 1,stage,T1,,,,', 'T1-S1-V01,Vessel 1,vessel,T1-S1,,4,1,1']],
      [
        'elements',
        [
          'serial,model,vessel,position,installed_at,removed_at,removal_reason',
          'E1,MX-400,T1-S1-V01,1,2021-01-01T00:00:00Z,2021-04-11T00:00:00Z,failed', // 100 days, event
          'E2,MX-400,T1-S1-V01,2,2021-01-01T00:00:00Z,2021-07-20T00:00:00Z,failed', // 200 days, event
          'E3,MX-400,T1-S1-V01,3,2021-01-01T00:00:00Z,,', // in service
          'E4,MX-400,T1-S1-V01,1,2021-04-11T00:00:00Z,,', // in service
        ],
      ],
      [
        'work-orders',
        [
          'wo_number,asset,type,priority,status,failure_code,description,reported_at,started_at,completed_at,out_of_service_from,out_of_service_to,labour_hours,labour_cost,parts_cost,crew',
          'W1,T1-S1-V01,corrective,high,closed,ELEM,Element failed,2021-04-10T06:00:00Z,2021-04-10T07:00:00Z,2021-04-11T00:00:00Z,,,5,250,620,crew-a',
        ],
      ],
      ['job-steps', ['wo_number,step,name,started_at,completed_at,guided,technician', 'W1,1,Isolate and depressurize,2021-04-10T08:00:00Z,2021-04-10T09:00:00Z,yes,tech-1', 'W1,2,Swap element,2021-04-10T09:00:00Z,2021-04-10T11:30:00Z,yes,tech-1']],
    ] as const;
    for (const [kind, lines] of steps) {
      const rec = await importText(t.db, kind, lines.join('\n'), { ...site, tz: 'UTC', fileName: `rt-${kind}.csv` });
      expect(rec.rejects).toEqual([]);
    }
  });
  afterAll(() => t.close());

  const get = (url: string, role: keyof TestApp['cookies'] | null = 'engineer') => {
    const req = request(t.app).get(url);
    return role ? req.set('Cookie', t.cookies[role]) : req;
  };

  describe('GET /api/kpi/element-life', () => {
    it('answers the groups of docs/design.md §7 with Kaplan–Meier survival', async () => {
      const res = await get('/api/kpi/element-life?site=RT&to=2022-01-01');
      expect(res.status).toBe(200);
      const body = elementLifeReportSchema.parse(res.body);
      const all = body.groups[0]!;
      // Lives: 100 E, 200 E, 265 C (E4 from 11 April), 365 C → S = 3/4, then × 2/3 = 1/2 (hand-worked).
      expect([all.key, all.n, all.events]).toEqual(['all', 4, 2]);
      expect(all.km.filter((p) => p.nEvents! > 0).map((p) => [p.tDays, p.survival])).toEqual([
        [100, 0.75],
        [200, 0.5],
      ]);
      expect(all.weibull).not.toBeNull();
      expect(body.provenance!.elements).toEqual(['E1', 'E2', 'E3', 'E4']);
    });

    it('refuses an unknown grouping (400) and an unknown asset (404)', async () => {
      const bad = await get('/api/kpi/element-life?site=RT&groupBy=colour');
      expect(bad.status).toBe(400);
      errorBodySchema.parse(bad.body);
      const missing = await get('/api/kpi/element-life?site=RT&asset=NOPE');
      expect(missing.status).toBe(404);
      expect(errorBodySchema.parse(missing.body).error.code).toBe('asset-not-found');
    });

    it('needs a session', async () => {
      expect((await get('/api/kpi/element-life?site=RT', null)).status).toBe(401);
    });
  });

  describe('GET /api/kpi/forecast', () => {
    it('answers twelve months with cost, totals and the vessel-work cautions; finance may read it', async () => {
      const res = await get('/api/kpi/forecast?site=RT&to=2022-01-01', 'finance');
      expect(res.status).toBe(200);
      const body = forecastReportSchema.parse(res.body);
      expect(body.asOf).toBe('2022-01-01T00:00:00.000Z');
      expect(body.groups[0]!.inService).toBe(2);
      expect(body.groups[0]!.months).toHaveLength(12);
      expect(body.totals[0]!.expectedCost).toBeCloseTo(body.totals[0]!.expectedCount * 620, 9);
      expect(res.body.cautions).toEqual(vesselWorkCautions);
    });
  });

  describe('GET /api/kpi/time-to-complete', () => {
    it('answers the job of W1 (08:00 → 11:30 = 3.5 h), guided, as an element replacement', async () => {
      const res = await get('/api/kpi/time-to-complete?site=RT');
      expect(res.status).toBe(200);
      const body = timeToCompleteReportSchema.parse(res.body);
      expect(body.jobs).toEqual([
        { woNumber: 'W1', startedAt: '2021-04-10T08:00:00.000Z', completedAt: '2021-04-10T11:30:00.000Z', hours: 3.5, guided: true, steps: 2, crew: 'crew-a', procedure: 'element replacement' },
      ]);
      expect(body.groups.map((g) => g.key)).toEqual(['all', 'guided=yes', 'guided=no', 'crew=crew-a', 'procedure=element replacement']);
      expect(res.body.cautions).toEqual(vesselWorkCautions);
    });

    it('is not for finance (403)', async () => {
      expect((await get('/api/kpi/time-to-complete?site=RT', 'finance')).status).toBe(403);
    });
  });

  describe('GET /api/kpi/maintenance-mix', () => {
    it('answers the mix; without a permeate tag the cost per m³ is null with a reason', async () => {
      const res = await get('/api/kpi/maintenance-mix?site=RT&from=2021-04-01&to=2021-05-01', 'manager');
      expect(res.status).toBe(200);
      const body = maintenanceMixReportSchema.parse(res.body);
      expect(body.labour).toMatchObject({ reactiveHours: 5, reactiveShare: 1 });
      expect(body.cost).toMatchObject({ totalCost: 870, producedM3: null, costPerM3: null });
      expect(body.cost.reason).toMatch(/No permeate_flow tag on train T1/);
    });
  });
});
