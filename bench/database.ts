// A database of a benchmark's own: on a throwaway cluster, or created (and dropped after) on the
// server DATABASE_URL names.
import pg from 'pg';
import { startThrowawayCluster } from '#server/db/cluster.ts';

export async function openBenchDatabase(prefix: string, log?: (line: string) => void): Promise<{ url: string; dispose: () => Promise<void> }> {
  const fromEnv = process.env.DATABASE_URL;
  const cluster = fromEnv ? undefined : await startThrowawayCluster(log);
  const serverUrl = fromEnv ?? cluster!.url;
  const dbName = `${prefix}_${Date.now()}`;
  const onServer = async (sql: string) => {
    const c = new pg.Client({ connectionString: serverUrl });
    await c.connect();
    try {
      await c.query(sql);
    } finally {
      await c.end();
    }
  };
  await onServer(`create database ${dbName}`);
  return {
    url: Object.assign(new URL(serverUrl), { pathname: `/${dbName}` }).toString(),
    dispose: () => (cluster ? cluster.dispose() : onServer(`drop database if exists ${dbName} with (force)`)),
  };
}
