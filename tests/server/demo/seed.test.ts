import { mkdtempSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { runImport } from '#server/importers/run.ts';
import { seedDemo, type SeedResult } from '#server/demo/seed.ts';
import { createTestDatabase, type TestDatabase } from '../../setup/db.ts';
import { counts } from '../importers/helpers.ts';

let t: TestDatabase;
let seeded: SeedResult;
const outDir = mkdtempSync(join(tmpdir(), 'osmia-demo-test-'));

beforeAll(async () => {
  t = await createTestDatabase();
  seeded = await seedDemo(t.db, { outDir, years: 1, stepMinutes: 60 });
});
afterAll(() => t.close());

describe('the demo plant, through the importers', () => {
  it('imports every generated file without a reject', () => {
    expect(seeded.records.map((r) => [r.file, r.status, r.rowsRejected])).toEqual(seeded.manifest.files.map((f) => [f.file, 'completed', 0]));
    for (const [i, f] of seeded.manifest.files.entries()) expect(seeded.records[i].rowsRead).toBe(f.rows);
  });

  it('importing the demo files a second time changes no row count', async () => {
    const before = await counts(t.db);
    for (const f of seeded.manifest.files) {
      const again = await runImport(t.db, { kind: f.kind, path: join(outDir, f.file), site: seeded.manifest.site.code, actor: 'test' });
      expect(again.status).toBe('duplicate');
    }
    expect(await counts(t.db)).toEqual(before);
    expect(before.samples).toBe(seeded.manifest.historian.rows);
  });

  it('refresh built hourly rollups and stop events', async () => {
    expect(seeded.refresh.hoursRebuilt).toBeGreaterThan(0);
    expect(seeded.refresh.stopsRebuilt).toBeGreaterThan(0);
    const { rows } = await t.db.$client.query(`select count(*)::int as n from downtime_events`);
    expect(rows[0].n).toBe(seeded.refresh.stopsRebuilt);
  });
});
