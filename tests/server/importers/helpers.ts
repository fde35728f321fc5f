import { mkdtempSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import type { ImportKind } from '#shared/schemas/enums.ts';
import type { Db } from '#server/db/client.ts';
import { runImport, type ImportOptions } from '#server/importers/run.ts';

const dir = mkdtempSync(join(tmpdir(), 'osmia-import-test-'));
let n = 0;

/** Write `content` to a fresh temp file and return its path. */
export function fileWith(content: string | Buffer, name = 'file.csv'): string {
  const path = join(dir, `${++n}-${name}`);
  writeFileSync(path, content);
  return path;
}

export function importText(db: Db, kind: ImportKind, content: string | Buffer, opts: Partial<ImportOptions> = {}) {
  return runImport(db, { kind, path: fileWith(content, opts.fileName ?? `${kind}.csv`), actor: 'test', ...opts });
}

/** A small invented plant: one train, two stages, vessels of 6 elements, a pump and tags. */
export const plant = {
  assets: [
    'code,name,kind,parent,rated_permeate_m3h,element_capacity,rack_row,rack_col',
    'TR1,Train 1,train,,120,,,',
    'TR1-S1,Stage 1,stage,TR1,,,,',
    'TR1-S1-V01,Vessel 1,vessel,TR1-S1,,6,1,1',
    'TR1-S1-V02,Vessel 2,vessel,TR1-S1,,6,1,2',
    'TR1-HPP,High-pressure pump,pump,TR1,,,,',
  ].join('\n'),
  tags: [
    'tag,asset,quantity,unit',
    'TR1.RUN,TR1,run_status,',
    'TR1.PF,TR1-S1,feed_pressure,psi',
    'TR1.QP,TR1-S1,permeate_flow,gpm',
    'TR1.CF,TR1-S1,feed_conductivity,mS/cm',
    'TR1.TF,TR1-S1,feed_temperature,degF',
    'TR1.PP,TR1-S1,permeate_pressure,bar',
  ].join('\n'),
};

export async function seedPlant(db: Db, site = 'TST', tz = 'Europe/Berlin') {
  const a = await importText(db, 'assets', plant.assets, { site, tz });
  const t = await importText(db, 'tags', plant.tags, { site });
  if (a.status !== 'completed' || t.status !== 'completed') throw new Error(`plant seed failed: ${JSON.stringify([a, t])}`);
}

export async function counts(db: Db): Promise<Record<string, number>> {
  const tables = ['sites', 'assets', 'tags', 'samples', 'work_orders', 'elements', 'job_steps'];
  const out: Record<string, number> = {};
  for (const t of tables) out[t] = Number((await db.$client.query(`select count(*) as n from ${t}`)).rows[0].n);
  return out;
}
