// The demo plant, imported the way a user imports a plant: generate canonical files, then run each
// through the one import path in order, then refresh what is derived once.
import { join } from 'node:path';
import type { ImportRecord } from '#shared/schemas/imports.ts';
import type { Db } from '../db/client.ts';
import { listSites } from '../db/queries/sites.ts';
import { refresh, type RefreshResult } from '../jobs/refresh.ts';
import { importFile } from '../services/imports.ts';
import { generateDemoPlant, type DemoManifest, type DemoOptions } from './generate.ts';

export interface SeedResult {
  manifest: DemoManifest;
  records: ImportRecord[];
  refresh: RefreshResult;
}

export async function seedDemo(db: Db, options: DemoOptions & { log?: (line: string) => void }): Promise<SeedResult> {
  const log = options.log ?? (() => {});
  const t0 = Date.now();
  log(`Generating the demo plant (${options.years ?? 3} years at ${options.stepMinutes ?? 5}-minute steps) in ${options.outDir} …`);
  const manifest = await generateDemoPlant(options);
  log(`  ${manifest.historian.rows.toLocaleString('en-US')} historian rows in ${((Date.now() - t0) / 1000).toFixed(1)} s`);
  const records: ImportRecord[] = [];
  for (const file of manifest.files) {
    // A bulk load: one refresh after the last file instead of one after each.
    const record = await importFile(db, {
      refresh: false,
      kind: file.kind,
      path: join(options.outDir, file.file),
      site: manifest.site.code,
      tz: manifest.site.timeZone,
      actor: 'seed --demo',
    });
    log(`  imported ${file.file}: ${record.status}, ${record.rowsInserted.toLocaleString('en-US')} new rows in ${(record.durationMs / 1000).toFixed(1)} s`);
    if (record.status === 'failed') throw new Error(`demo import of ${file.file} failed: ${record.error}`);
    records.push(record);
  }
  const refreshed = await refresh(db, { log: (l) => log(`  ${l}`) });
  log(`Demo plant ${manifest.site.name} (${manifest.site.code}) ready in ${((Date.now() - t0) / 1000).toFixed(1)} s.`);
  return { manifest, records, refresh: refreshed };
}

/** npm start: seed the demo plant on an empty database only. */
export async function seedDemoIfEmpty(db: Db, options: DemoOptions & { log?: (line: string) => void }): Promise<SeedResult | null> {
  if ((await listSites(db.$client)).length > 0) return null;
  return seedDemo(db, options);
}
