// GET /api/work-orders/open over HTTP on a small invented plant imported through the importers: which
// orders are open at an instant, which are overdue by the age limits of their priority, the backlog
// hours, the order of the list, the asset scope, the limit, roles and bad queries. Expected figures
// are worked out by hand from the rows below.
import request from 'supertest';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { errorBodySchema } from '#shared/schemas/error.ts';
import { maintenanceMixReportSchema } from '#shared/schemas/maintenance-mix.ts';
import { openWorkOrdersSchema } from '#shared/schemas/work-orders.ts';
import { createTestApp, type TestApp } from '../../setup/app.ts';
import { importText } from '../importers/helpers.ts';

const SITE = 'OWK';
let t: TestApp;

const assets = [
  'code,name,kind,parent,rated_permeate_m3h,element_capacity,rack_row,rack_col',
  'TR1,Train 1,train,,100,,,',
  'TR1-S1,Stage 1,stage,TR1,,,,',
  'TR1-HPP,High-pressure pump 1,pump,TR1,,,,',
  'TR2,Train 2,train,,100,,,',
].join('\n');

const header =
  'wo_number,asset,type,priority,status,failure_code,description,reported_at,started_at,completed_at,out_of_service_from,out_of_service_to,labour_hours,labour_cost,parts_cost,crew';
// Looked at as of 2025-03-01T00:00Z.
const workOrders = [
  header,
  // High, open 19 days (> 7): overdue. 6 h.
  'WO-1,TR1-HPP,corrective,high,open,SEAL-LEAK,Seal weeps at the drive end,2025-02-10T00:00:00Z,,,,,6,0,0,crew-a',
  // Medium, open 9 days (≤ 30). 4 h.
  'WO-2,TR1-S1,preventive,medium,open,,Probe the stage conductivity,2025-02-20T00:00:00Z,,,,,4,0,0,crew-a',
  // Emergency, in progress for half a day (≤ 1 d); no estimate yet.
  'WO-3,TR1,corrective,emergency,in_progress,HP-TRIP,Train tripped on high pressure,2025-02-28T12:00:00Z,2025-02-28T13:00:00Z,,,,0,0,0,crew-b',
  // Low, closed only after the instant: still open then, 55 days (≤ 90). 3 h.
  'WO-4,TR1-HPP,inspection,low,closed,,Vibration round,2025-01-05T00:00:00Z,2025-01-06T00:00:00Z,2025-03-05T00:00:00Z,,,3,0,0,crew-a',
  // Cancelled: not open work.
  'WO-5,TR1,corrective,high,cancelled,,Raised twice,2025-01-01T00:00:00Z,,,,,5,0,0,',
  // Completed before the instant.
  'WO-6,TR1-S1,corrective,medium,closed,ELEM-DAMAGE,Replace a damaged element,2025-02-01T00:00:00Z,2025-02-02T00:00:00Z,2025-02-15T00:00:00Z,,,8,0,0,crew-b',
  // Reported after the instant.
  'WO-7,TR1,corrective,high,open,,Not yet reported at the instant,2025-03-02T00:00:00Z,,,,,1,0,0,',
  // Another train: medium, open 90 days (> 30): overdue. 2 h.
  'WO-8,TR2,corrective,medium,open,VALVE-STUCK,Concentrate valve sticks,2024-12-01T00:00:00Z,,,,,2,0,0,crew-b',
].join('\n');

beforeAll(async () => {
  t = await createTestApp();
  const a = await importText(t.db, 'assets', assets, { site: SITE, tz: 'UTC' });
  expect(a.status).toBe('completed');
  const w = await importText(t.db, 'work-orders', workOrders, { site: SITE });
  expect(w.status).toBe('completed');
});
afterAll(() => t.close());

const asOf = '2025-03-01T00:00:00Z';
const get = (url: string, role: keyof TestApp['cookies'] = 'manager') => request(t.app).get(url).set('Cookie', t.cookies[role]);

describe('GET /api/work-orders/open', () => {
  it('lists the orders open at the instant, overdue first, then by priority and age, with counts and backlog hours', async () => {
    const res = await get(`/api/work-orders/open?site=${SITE}&to=${asOf}`);
    expect(res.status).toBe(200);
    const body = openWorkOrdersSchema.parse(res.body);
    expect(body).toMatchObject({ site: SITE, asOf: '2025-03-01T00:00:00.000Z', total: 5, overdue: 2, hours: 15, withoutEstimate: 1 });
    expect(body.overdueAfterDays).toEqual({ emergency: 1, high: 7, medium: 30, low: 90 });
    expect(body.workOrders.map((o) => [o.woNumber, o.overdue])).toEqual([
      ['WO-1', true],
      ['WO-8', true],
      ['WO-3', false],
      ['WO-2', false],
      ['WO-4', false],
    ]);
    const wo1 = body.workOrders[0];
    expect(wo1).toMatchObject({ asset: 'TR1-HPP', type: 'corrective', priority: 'high', status: 'open', labourHours: 6, description: 'Seal weeps at the drive end' });
    expect(wo1.ageDays).toBeCloseTo(19, 9);
    expect(body.workOrders.find((o) => o.woNumber === 'WO-3')!.ageDays).toBeCloseTo(0.5, 9);
  });

  it('counts the same backlog as the maintenance mix at the end of the same window', async () => {
    const open = openWorkOrdersSchema.parse((await get(`/api/work-orders/open?site=${SITE}&to=${asOf}`)).body);
    const mix = maintenanceMixReportSchema.parse((await get(`/api/kpi/maintenance-mix?site=${SITE}&from=2024-11-01T00:00:00Z&to=${asOf}`)).body);
    expect(mix.backlog.workOrders).toBe(open.total);
    expect(mix.backlog.hours).toBeCloseTo(open.hours, 9);
    expect(mix.backlog.withoutEstimate).toBe(open.withoutEstimate);
  });

  it('keeps to the asset and what is below it, and caps the list but not the counts', async () => {
    const train = openWorkOrdersSchema.parse((await get(`/api/work-orders/open?site=${SITE}&to=${asOf}&asset=TR1`)).body);
    expect(train).toMatchObject({ asset: 'TR1', total: 4, overdue: 1, hours: 13 });
    expect(train.workOrders.map((o) => o.woNumber)).toEqual(['WO-1', 'WO-3', 'WO-2', 'WO-4']);
    const capped = openWorkOrdersSchema.parse((await get(`/api/work-orders/open?site=${SITE}&to=${asOf}&limit=2`)).body);
    expect(capped.total).toBe(5);
    expect(capped.workOrders.map((o) => o.woNumber)).toEqual(['WO-1', 'WO-8']);
  });

  it('a week later, the emergency and the preventive order are open longer; the low one is closed', async () => {
    const body = openWorkOrdersSchema.parse((await get(`/api/work-orders/open?site=${SITE}&to=2025-03-08T00:00:00Z`)).body);
    // WO-7 is now reported and open 6 days (high, ≤ 7); WO-4 was completed on 5 March; WO-3 is 7.5 days old (> 1).
    expect(body.workOrders.map((o) => [o.woNumber, o.overdue])).toEqual([
      ['WO-3', true],
      ['WO-1', true],
      ['WO-8', true],
      ['WO-7', false],
      ['WO-2', false],
    ]);
    expect(body.hours).toBe(6 + 4 + 0 + 1 + 2);
  });

  it('refuses finance (403), a bad limit and an unknown asset', async () => {
    expect((await get(`/api/work-orders/open?site=${SITE}`, 'finance')).status).toBe(403);
    const bad = await get(`/api/work-orders/open?site=${SITE}&limit=0`);
    expect(bad.status).toBe(400);
    expect(errorBodySchema.parse(bad.body).error.code).toBe('validation-failed');
    const unknown = await get(`/api/work-orders/open?site=${SITE}&asset=NOPE`);
    expect(unknown.status).toBe(404);
    expect(errorBodySchema.parse(unknown.body).error.code).toBe('asset-not-found');
  });
});
