import { join } from 'node:path';
import { drizzle } from 'drizzle-orm/node-postgres';
import { migrate } from 'drizzle-orm/node-postgres/migrator';
import { projectRoot } from '../paths.ts';
import type { Db } from './client.ts';

export const migrationsFolder = join(projectRoot, 'drizzle');
const migrationLock = 7357001;

/** Apply the committed migrations in drizzle/; idempotent, and a lock serialises concurrent starts. */
export async function migrateDb(db: Db): Promise<void> {
  const client = await db.$client.connect();
  try {
    await client.query('select pg_advisory_lock($1)', [migrationLock]);
    await migrate(drizzle(client), { migrationsFolder });
  } finally {
    await client.query('select pg_advisory_unlock($1)', [migrationLock]).catch(() => undefined);
    client.release();
  }
}
