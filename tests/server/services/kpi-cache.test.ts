import { gunzipSync } from 'node:zlib';
import request from 'supertest';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { reliabilityQuerySchema, reliabilityReportSchema } from '#shared/schemas/reliability.ts';
import { dataVersionAndSettings } from '#server/db/queries/data-version.ts';
import { KpiCache } from '#server/services/kpi-cache.ts';
import { KpiWarmer } from '#server/services/kpi-warmer.ts';
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

describe('what the cache sends', () => {
  it('says in Server-Timing whether the answer was computed for this request or found', async () => {
    await importText(t.db, 'work-orders', `${header}\nWO-C3,TR1-HPP,corrective,high,closed,ORING,x,2026-01-12 08:00,2026-01-12 09:00,2026-01-12 10:00,,,1,1,1,crew-a\n`);
    const first = await request(t.app).get('/api/kpi/reliability?asset=TR1-HPP').set('Cookie', t.cookies.engineer).expect(200);
    expect(first.headers['server-timing']).toMatch(/^compute;dur=\d+(\.\d)?, encode;dur=\d+(\.\d)?$/);
    const second = await request(t.app).get('/api/kpi/reliability?asset=TR1-HPP').set('Cookie', t.cookies.engineer).expect(200);
    expect(second.headers['server-timing']).toBe('cache;desc="hit"');
    expect(second.body).toEqual(first.body);
  });

  it('answers first with a quick gzip, then swaps in a smaller one for later readers', async () => {
    const cache = new KpiCache();
    // Repetitive JSON, as KPI answers are: level 6 beats level 1 on it.
    const value = { points: Array.from({ length: 5000 }, (_, i) => ({ time: `2026-01-01T${String(i % 24).padStart(2, '0')}:00:00Z`, value: i % 97 })) };
    const first = await cache.get('v1', 'x', {}, async () => value);
    expect(first.hit).toBe(false);
    let later = await cache.get('v1', 'x', {}, async () => ({ other: true }));
    for (let i = 0; i < 50 && later.body.gzip.length === first.body.gzip.length; i++) {
      await new Promise((r) => setTimeout(r, 20));
      later = await cache.get('v1', 'x', {}, async () => ({ other: true }));
    }
    expect(later.hit).toBe(true);
    expect(later.body.gzip.length).toBeLessThan(first.body.gzip.length);
    expect(JSON.parse(gunzipSync(later.body.gzip).toString())).toEqual(value);
    expect(JSON.parse(gunzipSync(first.body.gzip).toString())).toEqual(value);
    // A new data version computes again.
    expect((await cache.get('v2', 'x', {}, async () => value)).hit).toBe(false);
  });
});

describe('answers kept ready after the data changes', () => {
  it('lists the questions of an older version, most recently asked first', async () => {
    const cache = new KpiCache();
    await cache.get('v1', 'a', { n: 1 }, async () => 1);
    await cache.get('v1', 'b', { n: 2 }, async () => 2);
    await cache.get('v2', 'c', { n: 3 }, async () => 3);
    await cache.get('v1', 'a', { n: 1 }, async () => 1); // asked again: now the most recent
    expect(cache.staleQuestions('v2', 10)).toEqual([
      { name: 'a', query: { n: 1 } },
      { name: 'b', query: { n: 2 } },
    ]);
    expect(cache.staleQuestions('v2', 1)).toHaveLength(1);
  });

  it('recomputes what was asked once a new version has held for two checks, so the next reader finds it cached', async () => {
    const w = await createTestApp();
    try {
      await seedPlant(w.db);
      const cache = new KpiCache();
      const warmer = new KpiWarmer(w.db, cache);
      const version = async () => (await dataVersionAndSettings(w.db.$client)).version;
      const ask = async () => cache.get(await version(), 'reliability', reliabilityQuerySchema.parse({ asset: 'TR1-HPP' }), async () => {
        throw new Error('should have been warmed');
      });
      const compute = (await import('#server/services/reliability.ts')).getReliability;
      const query = reliabilityQuerySchema.parse({ asset: 'TR1-HPP' });
      await cache.get(await version(), 'reliability', query, () => compute(w.db, query));
      await warmer.check(); // the version it starts from
      await importText(w.db, 'work-orders', `${header}\nWO-W1,TR1-HPP,corrective,high,closed,SEAL-LEAK,x,2026-02-10 08:00,2026-02-10 09:00,2026-02-10 10:00,,,1,1,1,crew-a\n`);
      await warmer.check(); // a new version, seen once: not yet
      expect(cache.staleQuestions(await version(), 10)).toEqual([{ name: 'reliability', query }]);
      await warmer.check(); // held: warm
      expect(cache.staleQuestions(await version(), 10)).toEqual([]);
      const warmed = await ask();
      expect(warmed.hit).toBe(true);
      expect(reliabilityReportSchema.parse(JSON.parse(warmed.body.json.toString())).failures).toBe(1);
      warmer.stop();
    } finally {
      await w.close();
    }
  });
});
