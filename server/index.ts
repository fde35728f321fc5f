import type { Server } from 'node:http';
import { createApp } from './app.ts';
import { secretKey } from './auth/session.ts';
import { createDb, closeDb, type Db } from './db/client.ts';
import type { Env } from './env.ts';

export interface RunningServer {
  url: string;
  db: Db;
  close: () => Promise<void>;
}

/** Listen on env.HOST:env.PORT with API and (when built) the client from one process. */
export async function startServer(env: Env): Promise<RunningServer> {
  const db = createDb(env.DATABASE_URL);
  const stops: Array<() => void> = [];
  const app = createApp({ db, env, sessionKey: secretKey(env.JWT_SECRET), onClose: (stop) => stops.push(stop) }, { clientDist: env.CLIENT_DIST });
  const server: Server = await new Promise((resolve, reject) => {
    const s = app.listen(env.PORT, env.HOST, () => resolve(s));
    s.once('error', reject);
  });
  const address = server.address();
  const port = typeof address === 'object' && address ? address.port : env.PORT;
  return {
    url: `http://${env.HOST}:${port}`,
    db,
    close: async () => {
      for (const stop of stops) stop();
      await new Promise<void>((resolve) => server.close(() => resolve()));
      server.closeAllConnections();
      // A client that hung up mid-request leaves its handler running: let the database work in flight
      // finish (up to 5 s) so it does not meet a closed pool.
      await poolSettled(db, 5000);
      await closeDb(db);
    },
  };
}

/** Resolves once no client is checked out of the pool or waited for, twice in a row 25 ms apart, or after `limitMs`. */
async function poolSettled(db: Db, limitMs: number): Promise<void> {
  const pool = db.$client;
  const busy = () => pool.totalCount > pool.idleCount || pool.waitingCount > 0;
  const until = Date.now() + limitMs;
  let quiet = 0;
  while (quiet < 2 && Date.now() < until) {
    await new Promise((resolve) => setTimeout(resolve, 25));
    quiet = busy() ? 0 : quiet + 1;
  }
}
