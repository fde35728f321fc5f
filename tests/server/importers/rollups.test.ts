// Hourly rollups summed by the historian importer while it streams (server/importers/historian.ts) must
// equal what a full refresh rebuilds from the samples (server/jobs/refresh.ts): the refresh's SQL is the
// reference. Five-minute samples of two tags, split across files at half past an hour (so an edge hour is
// merged), with bad-quality samples that must stay out, and one file out of time order (left to refresh).
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { refresh } from '#server/jobs/refresh.ts';
import { importFile } from '#server/services/imports.ts';
import { createTestDatabase, type TestDatabase } from '../../setup/db.ts';
import { fileWith, importText } from './helpers.ts';

let t: TestDatabase;
beforeAll(async () => {
  t = await createTestDatabase();
  const assets = await importText(t.db, 'assets', 'code,name,kind,parent,rated_permeate_m3h,element_capacity,rack_row,rack_col\nR1,Train,train,,10,,,\n', { site: 'ROLL', tz: 'UTC' });
  const tags = await importText(t.db, 'tags', 'tag,asset,quantity,unit\nR1.PF,R1,feed_pressure,psi\nR1.RUN,R1,run_status,\n', { site: 'ROLL' });
  expect([assets.status, tags.status]).toEqual(['completed', 'completed']);
});
afterAll(() => t.close());

const start = Date.UTC(2025, 2, 1);
function csv(fromMin: number, toMin: number, order: 'forward' | 'backward' = 'forward'): string {
  const lines: string[] = [];
  for (let m = fromMin; m < toMin; m += 5) {
    const ts = new Date(start + m * 60_000).toISOString();
    const bad = m % 35 === 0;
    lines.push(`${ts},R1.PF,${(100 + Math.sin(m) * 7).toFixed(4)},${bad ? 'bad' : 'good'}`, `${ts},R1.RUN,${Math.floor(m / 90) % 3 === 0 ? 0 : 1},good`);
  }
  if (order === 'backward') lines.reverse();
  return ['timestamp,tag,value,quality', ...lines].join('\n') + '\n';
}

type Row = { tag: string; hour: string; n: number; mean: number; min: number; max: number; last: string };
async function rollups(): Promise<Row[]> {
  const { rows } = await t.db.$client.query<Row>(
    `select g.name as tag, h.hour::text as hour, h.n, h.mean, h.min, h.max, h.last_ts::text as last
     from sample_hourly h join tags g on g.id = h.tag_id order by 1, 2`,
  );
  return rows;
}

describe('rollups written by the import', () => {
  it('equal the ones a full refresh rebuilds, across files that meet mid-hour and a file out of order', async () => {
    // 00:00–10:30, 10:30–20:00 (meets the first inside the 10:00 hour), then 20:00–24:00 backwards.
    for (const [a, b, order] of [[0, 630, 'forward'], [630, 1200, 'forward'], [1200, 1440, 'backward']] as const) {
      const r = await importFile(t.db, { kind: 'historian', path: fileWith(csv(a, b, order)), site: 'ROLL', actor: 'test' });
      expect(r).toMatchObject({ status: 'completed', derivedRefreshed: true });
    }
    const fromImports = await rollups();
    expect(fromImports).toHaveLength(48);
    const edge = fromImports.find((x) => x.tag === 'R1.PF' && x.hour.startsWith('2025-03-01 10:00'))!;
    // 12 samples in the 10:00 hour, one of them (10:30, minute 630 = 18 × 35) bad.
    expect(edge.n).toBe(11);
    await refresh(t.db, { full: true });
    const rebuilt = await rollups();
    expect(rebuilt.map(({ mean: _m, ...rest }) => rest)).toEqual(fromImports.map(({ mean: _m, ...rest }) => rest));
    rebuilt.forEach((row, i) => expect(fromImports[i]!.mean, `${row.tag} ${row.hour}`).toBeCloseTo(row.mean, 9));
  });
});
