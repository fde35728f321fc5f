import { drizzle, type NodePgDatabase } from 'drizzle-orm/node-postgres';
import pg from 'pg';
import * as schema from './schema.ts';

// timestamptz comes back as Date (pg's default); bigint counts (type 20) as numbers: our counts fit.
pg.types.setTypeParser(20, (v) => Number(v));

export type Db = NodePgDatabase<typeof schema> & { $client: pg.Pool };

export function createDb(url: string, options: { max?: number; connectionTimeoutMillis?: number } = {}): Db {
  // Sessions run in UTC so date_trunc('hour', …) of rollups means the same hour everywhere.
  // A server that does not answer (host away, not refusing) fails a request after 10 s with a 503
  // instead of holding it until the operating system gives up on the connection.
  const pool = new pg.Pool({
    connectionString: url,
    max: options.max ?? 10,
    connectionTimeoutMillis: options.connectionTimeoutMillis ?? 10_000,
    application_name: 'osmia',
    options: '-c TimeZone=UTC',
  });
  // An idle client that loses its connection must not crash the process.
  pool.on('error', () => {});
  return drizzle(pool, { schema }) as Db;
}

export async function closeDb(db: Db): Promise<void> {
  await db.$client.end();
}
