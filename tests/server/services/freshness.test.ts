// Freshness of KPI answers (server/services/freshness.ts): a plant uploaded through the API and asked at
// once; derived data lagging too far to rebuild inline is named in `warnings`; dataAsOf is the newest data
// up to the window's end. The plant is ops-plant.ts's (hourly samples Jan 1–11 2025, UTC).
import request from 'supertest';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { importRecordSchema } from '#shared/schemas/imports.ts';
import { kpiCatalog } from '#server/services/kpi-catalog.ts';
import { inlineRefreshTagHours } from '#server/services/freshness.ts';
import { refresh } from '#server/jobs/refresh.ts';
import { createTestApp, type TestApp } from '../../setup/app.ts';
import { assetsCsv, elementsCsv, historianCsv, tagsCsv, workOrdersCsv } from '../../fixtures/ops-plant.ts';

let t: TestApp;
beforeAll(async () => {
  t = await createTestApp();
});
afterAll(() => t.close());

const upload = (kind: string, content: string) =>
  request(t.app).post('/api/imports').set('Cookie', t.cookies.engineer).field('kind', kind).field('site', 'UPF').field('tz', 'UTC').attach('file', Buffer.from(content), `${kind}.csv`);
const kpi = (name: string, query = '') => request(t.app).get(`/api/kpi/${name}?site=UPF${query}`).set('Cookie', t.cookies.admin);
const historianKpis = kpiCatalog.filter((k) => k.readsDerived).map((k) => k.name);

describe('a plant uploaded through the page', () => {
  it('lands every file with derived data refreshed', async () => {
    for (const [kind, csv] of [['assets', assetsCsv], ['tags', tagsCsv], ['historian', historianCsv()], ['work-orders', workOrdersCsv], ['elements', elementsCsv]] as const) {
      const res = await upload(kind, csv);
      expect(res.status, JSON.stringify(res.body)).toBe(201);
      expect(importRecordSchema.parse(res.body)).toMatchObject({ status: 'completed', derivedRefreshed: true });
    }
  });

  it('answers every historian KPI with real events and points, up to date, without a refresh', async () => {
    expect(historianKpis).toEqual(['reliability', 'downtime', 'performance', 'maintenance-mix']);
    const downtime = (await kpi('downtime')).body;
    expect(downtime.events.length).toBe(4);
    const performance = (await kpi('performance', '&asset=TR1')).body;
    expect(performance.stages.every((s: { points: unknown[] }) => s.points.length > 0)).toBe(true);
    const reliability = (await kpi('reliability', '&asset=TR1')).body;
    expect(reliability).toMatchObject({ operatingTimeSource: 'run-status', operatingHours: 220 });
    const mix = (await kpi('maintenance-mix', '&asset=TR1')).body;
    expect(mix.cost.producedM3).toBeGreaterThan(0);
    for (const body of [downtime, performance, reliability, mix]) {
      expect(body).toMatchObject({ derivedUpToDate: true, warnings: [], dataAsOf: { newestSampleAt: '2025-01-11T00:00:00.000Z' } });
    }
  });

  it('gives the newest sample and work order up to the window end', async () => {
    const body = (await kpi('downtime', '&from=2025-01-01&to=2025-01-05')).body;
    // Hourly samples: the last before Jan 5 00:00 is Jan 4 23:00. The newest work-order time before it is WO-1's
    // return to service, Jan 3 18:00 (WO-6 is reported at Jan 5 00:00 itself, outside the half-open window).
    expect(body.dataAsOf).toEqual({ newestSampleAt: '2025-01-04T23:00:00.000Z', newestWorkOrderAt: '2025-01-03T18:00:00.000Z' });
    // Element life reads no derived table: always up to date.
    expect((await kpi('element-life')).body).toMatchObject({ derivedUpToDate: true, warnings: [] });
  });
});

describe('derived data lagging more than a request rebuilds', () => {
  it('answers with a warning naming the command, then none once refreshed', async () => {
    // What a bulk load with --no-refresh leaves: years of queued hours for one run-status tag.
    const tag = (await t.db.$client.query<{ id: number }>(`select id from tags where name = 'TR1.RUN' and site_id = (select id from sites where code = 'UPF')`)).rows[0]!.id;
    await t.db.$client.query(`insert into dirty_hours (tag_id, from_hour, to_hour) values ($1, '2020-01-01', '2025-01-11')`, [tag]);
    const lagging = (await t.db.$client.query<{ h: number }>(`select sum(extract(epoch from to_hour - from_hour) / 3600)::float8 as h from dirty_hours`)).rows[0]!.h;
    expect(lagging).toBeGreaterThan(inlineRefreshTagHours);
    for (const name of historianKpis) {
      const body = (await kpi(name)).body;
      expect(body.derivedUpToDate, name).toBe(false);
      expect(body.warnings, name).toEqual([expect.stringContaining('Run "bin/osmia refresh"')]);
      expect(body.warnings[0]).toMatch(/^Samples imported for 1 tag of UPF are not yet in the hourly rollups/);
    }
    expect((await kpi('time-to-complete')).body.derivedUpToDate).toBe(true);
    await refresh(t.db);
    for (const name of historianKpis) expect((await kpi(name)).body, name).toMatchObject({ derivedUpToDate: true, warnings: [] });
  });
});
