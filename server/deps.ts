import type { Db } from './db/client.ts';
import type { Env } from './env.ts';

/** What every router and service of one app instance shares. */
export interface AppDeps {
  db: Db;
  env: Env;
  sessionKey: Uint8Array;
  /** Registers what to stop when the server closes (background timers); absent in tests that never close. */
  onClose?: (stop: () => void) => void;
}
