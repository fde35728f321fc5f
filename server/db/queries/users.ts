import { asc, eq, sql, and, ne } from 'drizzle-orm';
import type { Db } from '../client.ts';
import { users } from '../schema.ts';
import type { Role } from '#shared/schemas/enums.ts';
import type { User } from '#shared/schemas/users.ts';

type UserRow = typeof users.$inferSelect;

const toUser = (row: Omit<UserRow, 'passwordHash' | 'sessionGeneration'>): User => ({
  id: row.id,
  email: row.email,
  name: row.name,
  role: row.role as Role,
  disabled: row.disabled,
  digest: row.digest,
  createdAt: row.createdAt.toISOString(),
  lastLoginAt: row.lastLoginAt?.toISOString() ?? null,
});

export async function listUsers(db: Db): Promise<User[]> {
  const rows = await db.select().from(users).orderBy(asc(users.email));
  return rows.map(toUser);
}

/**
 * The user of a session and the session generation its token must carry. Every authenticated request
 * asks this: one primary-key lookup, a prepared statement, not a query built each time.
 */
export async function findSessionUser(db: Db, id: number): Promise<{ user: User; sessionGeneration: number } | undefined> {
  const { rows } = await db.$client.query<Omit<UserRow, 'passwordHash'>>({
    name: 'session-user-by-id',
    text: `select id, email, name, role, disabled, digest, created_at as "createdAt", last_login_at as "lastLoginAt", session_generation as "sessionGeneration" from users where id = $1`,
    values: [id],
  });
  return rows[0] && { user: toUser(rows[0]), sessionGeneration: rows[0].sessionGeneration };
}

export async function findUserById(db: Db, id: number): Promise<User | undefined> {
  return (await findSessionUser(db, id))?.user;
}

export async function findUserWithHash(db: Db, email: string): Promise<(User & { passwordHash: string; sessionGeneration: number }) | undefined> {
  const [row] = await db
    .select()
    .from(users)
    .where(sql`lower(${users.email}) = lower(${email})`);
  return row && { ...toUser(row), passwordHash: row.passwordHash, sessionGeneration: row.sessionGeneration };
}

export async function insertUser(
  db: Db,
  values: { email: string; name: string; role: Role; passwordHash: string; digest?: boolean },
): Promise<User | undefined> {
  const [row] = await db.insert(users).values(values).onConflictDoNothing().returning();
  return row && toUser(row);
}

/** With `endSessions`, the session generation goes up in the same statement: earlier tokens stop working. */
export async function updateUser(
  db: Db,
  id: number,
  values: Partial<{ name: string; role: Role; disabled: boolean; passwordHash: string; digest: boolean }>,
  options: { endSessions?: boolean } = {},
): Promise<{ user: User; sessionGeneration: number } | undefined> {
  const set = options.endSessions ? { ...values, sessionGeneration: sql`${users.sessionGeneration} + 1` } : values;
  const [row] = await db.update(users).set(set).where(eq(users.id, id)).returning();
  return row && { user: toUser(row), sessionGeneration: row.sessionGeneration };
}

/** Sign-out: every session of the user ends. */
export async function endUserSessions(db: Db, id: number): Promise<void> {
  await db
    .update(users)
    .set({ sessionGeneration: sql`${users.sessionGeneration} + 1` })
    .where(eq(users.id, id));
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

/** Who receives the nightly mail: enabled users who subscribed, by e-mail. */
export async function listSubscribedUsers(db: Db): Promise<Pick<User, 'id' | 'email' | 'name' | 'role'>[]> {
  const rows = await db
    .select({ id: users.id, email: users.email, name: users.name, role: users.role })
    .from(users)
    .where(and(eq(users.digest, true), eq(users.disabled, false)))
    .orderBy(asc(users.email));
  return rows.map((r) => ({ ...r, role: r.role as Role }));
}
