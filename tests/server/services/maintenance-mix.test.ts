// Maintenance mix through the importers, `osmia refresh` and the service: labour mix, PM compliance,
// backlog and cost per m³ of permeate produced from hourly rollups, all worked by hand.
import { beforeFreshnessSchema, type BeforeFreshness } from '#shared/schemas/common.ts';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { maintenanceMixQuerySchema, maintenanceMixReportSchema, type MaintenanceMixReport } from '#shared/schemas/maintenance-mix.ts';
import { refresh } from '#server/jobs/refresh.ts';
import { getMaintenanceMix } from '#server/services/maintenance-mix.ts';
import { updateSettings } from '#server/services/settings.ts';
import { createTestDatabase, type TestDatabase } from '../../setup/db.ts';
import { importText } from '../importers/helpers.ts';
import { getSettings } from '#server/services/settings.ts';

let t: TestDatabase;

const assets = [
  'code,name,kind,parent,rated_permeate_m3h,element_capacity,rack_row,rack_col',
  'T1,Train 1,train,,100,,,',
  'T1-S1,Train 1 stage 1,stage,T1,,,,',
  'T1-S1-V01,Vessel 1,vessel,T1-S1,,6,1,1',
  'T1-HPP,High-pressure pump,pump,T1,,,,',
  'T2,Train 2,train,,100,,,',
].join('\n');
const tags = ['tag,asset,quantity,unit', 'T1.QP,T1-S1,permeate_flow,m3/h', 'T1.RUN,T1,run_status,'].join('\n');

/**
 * Permeate flow on 1 January 2021 (UTC): 40 m³/h at :00 and 60 m³/h at :30 of every hour, so each
 * hourly mean is 50 m³/h and the day makes 24 × 50 = 1200 m³; a bad-quality 9999 at 12:15 that must
 * not count; and 80 m³/h at 00:00 on 2 January (outside a one-day window).
 */
const historian = [
  'timestamp,tag,value,quality',
  ...Array.from({ length: 24 }, (_, h) => {
    const hh = String(h).padStart(2, '0');
    return [`2021-01-01T${hh}:00:00Z,T1.QP,40,good`, `2021-01-01T${hh}:30:00Z,T1.QP,60,good`];
  }).flat(),
  '2021-01-01T12:15:00Z,T1.QP,9999,bad',
  '2021-01-02T00:00:00Z,T1.QP,80,good',
].join('\n');

const workOrders = [
  'wo_number,asset,type,priority,status,failure_code,description,reported_at,started_at,completed_at,out_of_service_from,out_of_service_to,labour_hours,labour_cost,parts_cost,crew',
  'W1,T1-HPP,corrective,high,closed,SEAL,Seal leak,2021-01-01T02:00:00Z,2021-01-01T03:00:00Z,2021-01-01T09:00:00Z,,,6,300,120,crew-a',
  'W2,T1-S1-V01,preventive,medium,closed,,Element swap,2021-01-01T01:00:00Z,2021-01-01T10:00:00Z,2021-01-01T12:00:00Z,,,2,100,0,crew-a',
  'W3,T1,preventive,medium,open,,Quarterly check,2021-01-01T05:00:00Z,,,,,4,0,0,',
  'W4,T1,preventive,low,cancelled,,Dropped check,2021-01-01T06:00:00Z,,,,,0,0,0,',
  'W5,T1-S1,inspection,low,closed,,Walk-down,2020-12-31T20:00:00Z,2021-01-01T08:00:00Z,2021-01-01T10:00:00Z,,,2,80,0,crew-b',
  'W6,T2,corrective,high,open,LEAK,Leak,2020-12-20T08:00:00Z,,,,,8,0,0,',
  'W7,T1,improvement,low,closed,,Old job,2020-12-28T08:00:00Z,2020-12-29T08:00:00Z,2020-12-30T08:00:00Z,,,5,250,0,crew-b',
].join('\n');

beforeAll(async () => {
  t = await createTestDatabase();
  expect((await importText(t.db, 'assets', assets, { site: 'MIX', tz: 'UTC' })).status).toBe('completed');
  expect((await importText(t.db, 'tags', tags, { site: 'MIX' })).status).toBe('completed');
  const h = await importText(t.db, 'historian', historian, { site: 'MIX' });
  expect(h.rejects).toEqual([]);
  expect((await importText(t.db, 'work-orders', workOrders, { site: 'MIX' })).rejects).toEqual([]);
  await refresh(t.db);
  expect((await importText(t.db, 'assets', assets, { site: 'NODATA', tz: 'UTC', fileName: 'nodata.csv' })).status).toBe('completed');
});
afterAll(() => t.close());

async function mix(query: Record<string, unknown>): Promise<BeforeFreshness<MaintenanceMixReport>> {
  return beforeFreshnessSchema(maintenanceMixReportSchema).parse(await getMaintenanceMix(t.db, maintenanceMixQuerySchema.parse(query), await getSettings(t.db)));
}

const day = { from: '2021-01-01T00:00:00Z', to: '2021-01-02T00:00:00Z' };

describe('maintenance mix', () => {
  it('splits the labour of closed orders completed in the window into planned and reactive shares', async () => {
    const r = await mix({ site: 'MIX', ...day });
    // W1 corrective 6 h; W2 preventive 2 h; W5 inspection 2 h (reported before the window, completed in it).
    expect(r.labour).toMatchObject({ plannedHours: 4, reactiveHours: 6, improvementHours: 0, totalHours: 10, plannedShare: 0.4, reactiveShare: 0.6 });
    expect(r.labour.workOrders).toEqual(['W1', 'W2', 'W5']);
  });

  it('counts PM compliance over the preventive orders raised in the window, cancelled ones left out', async () => {
    const r = await mix({ site: 'MIX', ...day });
    // Raised: W2 (closed), W3 (open), W4 (cancelled) → due 2, done 1 → 0.5.
    expect(r.pmCompliance).toMatchObject({ raised: 3, cancelled: 1, due: 2, completedInWindow: 1, compliance: 0.5, completed: ['W2'], missed: ['W3'] });
    const strict = await mix({ site: 'MIX', ...day, cancelledPmCountsAsMissed: 'true' });
    expect(strict.pmCompliance.compliance).toBeCloseTo(1 / 3, 12);
  });

  it('measures the backlog at the window end in hours and in weeks of crew capacity', async () => {
    const r = await mix({ site: 'MIX', ...day });
    // W3 (4 h) and W6 (8 h) are open at the end: 12 h / 160 h per week (default setting) = 0.075 weeks.
    expect(r.backlog).toMatchObject({ workOrders: 2, hours: 12, crewCapacityHoursPerWeek: 160, list: ['W3', 'W6'] });
    expect(r.backlog.weeks).toBeCloseTo(0.075, 12);
  });

  it('sets the cost against the permeate of the train: 1200 m³ from hourly means of 50 m³/h, bad samples left out', async () => {
    const r = await mix({ site: 'MIX', asset: 'T1', ...day });
    expect(r.cost).toMatchObject({ labourCost: 480, partsCost: 120, totalCost: 600, reason: null });
    expect(r.cost.producedM3).toBeCloseTo(1200, 9);
    expect(r.cost.costPerM3).toBeCloseTo(0.5, 12);
    expect(r.provenance!.tags).toEqual(['T1.QP']);
    expect(r.provenance!.workOrders).toEqual(['W1', 'W2', 'W3', 'W4', 'W5']);
    expect(r.notes).toEqual([]);
  });

  it('counts only the part of an hour inside the window (06:30–12:00 → 0.5 × 50 + 5 × 50 = 275 m³)', async () => {
    const r = await mix({ site: 'MIX', asset: 'T1', from: '2021-01-01T06:30:00Z', to: '2021-01-01T12:00:00Z' });
    expect(r.cost.producedM3).toBeCloseTo(275, 9);
  });

  it('says when the window has hours without permeate data', async () => {
    const r = await mix({ site: 'MIX', asset: 'T1', from: '2021-01-01T00:00:00Z', to: '2021-01-03T00:00:00Z' });
    expect(r.cost.producedM3).toBeCloseTo(1200 + 80, 9);
    expect(r.notes.join(' ')).toMatch(/T1\.QP has hourly data for 25\.0 of the window's 48\.0 h/);
  });

  it('for an asset below a train, uses the production of that train', async () => {
    const r = await mix({ site: 'MIX', asset: 'T1-S1-V01', ...day });
    expect(r.asset).toBe('T1-S1-V01');
    expect(r.cost.totalCost).toBe(100);
    expect(r.cost.costPerM3).toBeCloseTo(100 / 1200, 12);
  });

  it('cost per m³ is null with a reason when a train has no permeate flow tag', async () => {
    const site = await mix({ site: 'MIX', ...day });
    expect(site.cost.producedM3).toBeNull();
    expect(site.cost.costPerM3).toBeNull();
    expect(site.cost.reason).toMatch(/No permeate_flow tag on train T2/);
    const t2 = await mix({ site: 'MIX', asset: 'T2', ...day });
    expect(t2.cost.reason).toMatch(/train T2/);
    expect(t2.backlog.list).toEqual(['W6']);
  });

  it('a site without data gets an empty window and nulls with reasons, never NaN', async () => {
    const r = await mix({ site: 'NODATA' });
    expect(r.from).toBe(r.to);
    expect(r.labour.plannedShare).toBeNull();
    expect(r.pmCompliance.compliance).toBeNull();
    expect(r.cost.costPerM3).toBeNull();
    expect(r.cost.reason).toMatch(/No permeate_flow tag on train T1, T2/);
    expect(r.notes).toContain('The site has no data yet, so the window is empty.');
    expect(JSON.stringify(r)).not.toMatch(/NaN|Infinity/);
  });

  it('reads the crew capacity from the settings', async () => {
    await updateSettings(t.db, { crewHoursPerWeek: 80 }, 'test');
    const r = await mix({ site: 'MIX', ...day });
    expect(r.backlog.weeks).toBeCloseTo(12 / 80, 12);
  });
});
