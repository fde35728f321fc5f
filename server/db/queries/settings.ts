import { sql } from 'drizzle-orm';
import type { Db } from '../client.ts';
import { settings } from '../schema.ts';

/** Read on every KPI request: a prepared statement, not a query built each time. */
export async function readSettingRows(db: Db): Promise<Record<string, unknown>> {
  const { rows } = await db.$client.query<{ key: string; value: unknown }>({ name: 'setting-rows', text: 'select key, value from settings' });
  return Object.fromEntries(rows.map((r) => [r.key, r.value]));
}

export async function writeSettingRows(db: Db, values: Record<string, unknown>, actor: string): Promise<void> {
  const entries = Object.entries(values);
  if (entries.length === 0) return;
  await db
    .insert(settings)
    .values(entries.map(([key, value]) => ({ key, value, updatedBy: actor })))
    .onConflictDoUpdate({
      target: settings.key,
      set: { value: sql`excluded.value`, updatedAt: sql`now()`, updatedBy: sql`excluded.updated_by` },
    });
}
