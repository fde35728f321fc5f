import type { NextFunction, Request, Response, RequestHandler } from 'express';
import type { Role } from '#shared/schemas/enums.ts';
import type { User } from '#shared/schemas/users.ts';
import type { Db } from '../db/client.ts';
import { findUserById } from '../db/queries/users.ts';
import { HttpError } from '../errors.ts';
import { sessionCookie, verifySession } from './session.ts';

declare global {
  // eslint-disable-next-line @typescript-eslint/no-namespace
  namespace Express {
    interface Locals {
      user?: User;
      /** Why there is no user although a cookie came: shapes the 401 message. */
      sessionProblem?: 'expired' | 'invalid' | 'disabled';
    }
  }
}

/** Reads the session cookie on every request; never refuses by itself (allow() does). */
export function authenticate(db: Db, key: Uint8Array): RequestHandler {
  return async (req: Request, res: Response, next: NextFunction) => {
    const token: unknown = req.cookies?.[sessionCookie];
    if (typeof token !== 'string' || token === '') return next();
    const verified = await verifySession(token, key);
    if (!verified.ok) {
      res.locals.sessionProblem = verified.reason;
      return next();
    }
    const user = await findUserById(db, verified.userId);
    if (!user || user.disabled) res.locals.sessionProblem = user ? 'disabled' : 'invalid';
    else res.locals.user = user;
    next();
  };
}

/** 401 without a valid session, 403 when the user's role is not among `roles`. */
export function allow(roles: readonly Role[]): RequestHandler {
  return (_req, res, next) => {
    const user = res.locals.user;
    if (!user) {
      const problem = res.locals.sessionProblem;
      if (problem === 'disabled') throw new HttpError(401, 'account-disabled');
      throw new HttpError(401, problem ? 'session-expired' : 'unauthenticated');
    }
    if (!roles.includes(user.role)) throw new HttpError(403, 'forbidden');
    next();
  };
}

/** The signed-in user of a route guarded by allow(). */
export function currentUser(res: Response): User {
  const user = res.locals.user;
  if (!user) throw new HttpError(401, 'unauthenticated');
  return user;
}
