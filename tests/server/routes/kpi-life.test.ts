// GET /api/kpi/element-life, forecast, time-to-complete and maintenance-mix over HTTP: status,
// body parsed with the shared schemas, the numbers of a small invented plant, errors and roles.
import request from 'supertest';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { vesselWorkCautions } from '#shared/cautions.ts';
import { elementLifeReportSchema } from '#shared/schemas/element-life.ts';
import { forecastReportSchema } from '#shared/schemas/forecast.ts';
import { timeToCompleteReportSchema } from '#shared/schemas/time-to-complete.ts';
import { maintenanceMixReportSchema } from '#shared/schemas/maintenance-mix.ts';
import { errorBodySchema } from '#shared/schemas/error.ts';
import { createTestApp, type TestApp } from '../../setup/app.ts';
import { importText } from '../importers/helpers.ts';

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
