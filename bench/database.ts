// A database of a benchmark's own: on a throwaway cluster, or created (and dropped after) on the
// server DATABASE_URL names. With DATABASE_URL, `keep` leaves it there for another run and `reuse`
// names one kept before (nothing is created or dropped then).
import pg from 'pg';
import { startThrowawayCluster } from '#server/db/cluster.ts';

export async function openBenchDatabase(
  prefix: string,
  log?: (line: string) => void,
  options: { keep?: boolean; reuse?: string } = {},
): Promise<{ url: string; dispose: () => Promise<void> }> {
  const fromEnv = process.env.DATABASE_URL;
  if ((options.keep || options.reuse) && !fromEnv) throw new Error('--keep and --reuse need DATABASE_URL: a throwaway cluster goes away with the run.');
  if (options.reuse) {
    if (!/^[a-z_][a-z0-9_]*$/.test(options.reuse)) throw new Error(`--reuse: "${options.reuse}" is not a database name.`);
    return { url: Object.assign(new URL(fromEnv!), { pathname: `/${options.reuse}` }).toString(), dispose: async () => {} };
  }
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
  if (options.keep) log?.(`benchmark database kept: ${dbName} (run again with --reuse ${dbName})`);
  return {
    url: Object.assign(new URL(serverUrl), { pathname: `/${dbName}` }).toString(),
    dispose: () => (cluster ? cluster.dispose() : options.keep ? Promise.resolve() : onServer(`drop database if exists ${dbName} with (force)`)),
  };
}
