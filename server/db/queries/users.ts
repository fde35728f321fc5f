import { asc, eq, sql, and, ne } from 'drizzle-orm';
import type { Db } from '../client.ts';
import { users } from '../schema.ts';
import type { Role } from '#shared/schemas/enums.ts';
import type { User } from '#shared/schemas/users.ts';

type UserRow = typeof users.$inferSelect;

const toUser = (row: Omit<UserRow, 'passwordHash'>): User => ({
  id: row.id,
  email: row.email,
  name: row.name,
  role: row.role as Role,
  disabled: row.disabled,
  createdAt: row.createdAt.toISOString(),
  lastLoginAt: row.lastLoginAt?.toISOString() ?? null,
});

export async function listUsers(db: Db): Promise<User[]> {
  const rows = await db.select().from(users).orderBy(asc(users.email));
  return rows.map(toUser);
}

/** Every authenticated request asks this: a prepared statement, not a query built each time. */
export async function findUserById(db: Db, id: number): Promise<User | undefined> {
  const { rows } = await db.$client.query<Omit<UserRow, 'passwordHash'>>({
    name: 'user-by-id',
    text: `select id, email, name, role, disabled, created_at as "createdAt", last_login_at as "lastLoginAt" from users where id = $1`,
    values: [id],
  });
  return rows[0] && toUser(rows[0]);
}

export async function findUserWithHash(db: Db, email: string): Promise<(User & { passwordHash: string }) | undefined> {
  const [row] = await db
    .select()
    .from(users)
    .where(sql`lower(${users.email}) = lower(${email})`);
  return row && { ...toUser(row), passwordHash: row.passwordHash };
}

export async function insertUser(
  db: Db,
  values: { email: string; name: string; role: Role; passwordHash: string },
): Promise<User | undefined> {
  const [row] = await db.insert(users).values(values).onConflictDoNothing().returning();
  return row && toUser(row);
}

export async function updateUser(
  db: Db,
  id: number,
  values: Partial<{ name: string; role: Role; disabled: boolean; passwordHash: string }>,
): Promise<User | undefined> {
  const [row] = await db.update(users).set(values).where(eq(users.id, id)).returning();
  return row && toUser(row);
}

export async function touchLastLogin(db: Db, id: number): Promise<void> {
  await db.update(users).set({ lastLoginAt: new Date() }).where(eq(users.id, id));
}

export async function countOtherActiveAdmins(db: Db, exceptId: number): Promise<number> {
  const [row] = await db
    .select({ n: sql<number>`count(*)::int` })
    .from(users)
    .where(and(eq(users.role, 'admin'), eq(users.disabled, false), ne(users.id, exceptId)));
  return row?.n ?? 0;
}

export async function countUsers(db: Db): Promise<number> {
  const [row] = await db.select({ n: sql<number>`count(*)::int` }).from(users);
  return row?.n ?? 0;
}
