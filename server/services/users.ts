import type { Role } from '#shared/schemas/enums.ts';
import type { MeUpdateBody, User, UserCreateBody, UserUpdateBody } from '#shared/schemas/users.ts';
import { decoyHash, hashPassword, verifyPassword } from '../auth/passwords.ts';
import type { Db } from '../db/client.ts';
import {
  countOtherActiveAdmins,
  findUserById,
  findUserWithHash,
  insertUser,
  touchLastLogin,
  updateUser,
} from '../db/queries/users.ts';
import { HttpError, conflict, notFound } from '../errors.ts';

/** `digest` may be left out (not subscribed), as the request body's schema fills it in. */
export async function createUser(db: Db, body: Omit<UserCreateBody, 'digest'> & { digest?: boolean }, cost: number): Promise<User> {
  const passwordHash = await hashPassword(body.password, cost);
  const user = await insertUser(db, { email: body.email, name: body.name, role: body.role, passwordHash, digest: body.digest ?? false });
  if (!user) throw conflict('email-taken');
  return user;
}

/**
 * Change a user. A new password, another role or disabling ends the user's earlier sessions; the
 * answer carries the session generation a new token for this user must hold.
 */
export async function changeUser(
  db: Db,
  id: number,
  body: UserUpdateBody,
  cost: number,
  actorId: number,
): Promise<{ user: User; sessionGeneration: number; sessionsEnded: boolean }> {
  const existing = await findUserById(db, id);
  if (!existing) throw notFound('user-not-found');
  const losesAdmin = existing.role === 'admin' && ((body.role && body.role !== 'admin') || body.disabled === true);
  if (losesAdmin && (await countOtherActiveAdmins(db, id)) === 0) {
    throw new HttpError(409, 'last-admin');
  }
  if (id === actorId && body.disabled === true) throw new HttpError(409, 'bad-request', 'You cannot disable your own account.');
  const { password, ...rest } = body;
  const values: Partial<{ name: string; role: Role; disabled: boolean; passwordHash: string; digest: boolean }> = { ...rest };
  if (password) values.passwordHash = await hashPassword(password, cost);
  const sessionsEnded = Boolean(password) || (body.role !== undefined && body.role !== existing.role) || (body.disabled === true && !existing.disabled);
  const updated = await updateUser(db, id, values, { endSessions: sessionsEnded });
  if (!updated) throw notFound('user-not-found');
  return { ...updated, sessionsEnded };
}

/**
 * Check e-mail and password; the same time is spent whether or not the e-mail exists. Answers the
 * user and the session generation the new token must carry.
 */
export async function signIn(db: Db, email: string, password: string): Promise<{ user: User; sessionGeneration: number }> {
  const found = await findUserWithHash(db, email);
  const ok = await verifyPassword(password, found?.passwordHash ?? decoyHash());
  if (!found || !ok) throw new HttpError(401, 'invalid-credentials');
  if (found.disabled) throw new HttpError(401, 'account-disabled');
  await touchLastLogin(db, found.id);
  const { passwordHash: _omit, sessionGeneration, ...user } = found;
  return { user, sessionGeneration };
}

/** A user's own changes (PATCH /api/auth/me): the digest subscription; sessions are left alone. */
export async function changeOwnAccount(db: Db, id: number, body: MeUpdateBody): Promise<User> {
  const updated = await updateUser(db, id, { digest: body.digest });
  if (!updated) throw notFound('user-not-found');
  return updated.user;
}
