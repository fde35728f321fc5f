import type { Role } from '#shared/schemas/enums.ts';
import type { Db } from '../db/client.ts';
import { countUsers } from '../db/queries/users.ts';
import { createUser } from '../services/users.ts';

/**
 * One sign-in per role for the demo; reserved .example domain, passwords printed by `npm start`. The
 * manager and the finance analyst receive the nightly digest, as those roles would (docs/design.md §2).
 */
export const demoUsers: { email: string; name: string; role: Role; password: string; digest: boolean }[] = [
  { email: 'admin@osmia.example', name: 'Demo administrator', role: 'admin', password: 'demo-admin-pass', digest: false },
  { email: 'engineer@osmia.example', name: 'Demo reliability engineer', role: 'engineer', password: 'demo-engineer-pass', digest: false },
  { email: 'manager@osmia.example', name: 'Demo plant manager', role: 'manager', password: 'demo-manager-pass', digest: true },
  { email: 'finance@osmia.example', name: 'Demo finance analyst', role: 'finance', password: 'demo-finance-pass', digest: true },
];

/** Adds the demo users when the users table is empty; returns how many were added. */
export async function seedDemoUsers(db: Db, cost: number): Promise<number> {
  if ((await countUsers(db)) > 0) return 0;
  for (const u of demoUsers) await createUser(db, u, cost);
  return demoUsers.length;
}
