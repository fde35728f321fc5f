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
  const app = createApp({ db, env, sessionKey: secretKey(env.JWT_SECRET) }, { clientDist: env.CLIENT_DIST });
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
      await new Promise<void>((resolve) => server.close(() => resolve()));
      server.closeAllConnections();
      await closeDb(db);
    },
  };
}
