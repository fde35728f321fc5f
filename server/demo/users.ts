import type { Role } from '#shared/schemas/enums.ts';
import type { Db } from '../db/client.ts';
import { countUsers } from '../db/queries/users.ts';
import { createUser } from '../services/users.ts';

/** One sign-in per role for the demo; reserved .example domain, passwords printed by `npm start`. */
export const demoUsers: { email: string; name: string; role: Role; password: string }[] = [
  { email: 'admin@osmia.example', name: 'Demo administrator', role: 'admin', password: 'demo-admin-pass' },
  { email: 'engineer@osmia.example', name: 'Demo reliability engineer', role: 'engineer', password: 'demo-engineer-pass' },
  { email: 'manager@osmia.example', name: 'Demo plant manager', role: 'manager', password: 'demo-manager-pass' },
  { email: 'finance@osmia.example', name: 'Demo finance analyst', role: 'finance', password: 'demo-finance-pass' },
];

/** Adds the demo users when the users table is empty; returns how many were added. */
export async function seedDemoUsers(db: Db, cost: number): Promise<number> {
  if ((await countUsers(db)) > 0) return 0;
  for (const u of demoUsers) await createUser(db, u, cost);
  return demoUsers.length;
}
