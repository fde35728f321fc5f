import type { Db } from './client.ts';
import { migrateDb } from './migrate.ts';

/** Drop every Osmia table (and drizzle's migration journal), then apply the migrations again. */
export async function resetDb(db: Db): Promise<void> {
  await db.$client.query('drop schema if exists public cascade; drop schema if exists drizzle cascade; create schema public;');
  await migrateDb(db);
}
