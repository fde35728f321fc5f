import type { NextFunction, Request, Response, RequestHandler } from 'express';
import type { ErrorCode } from '#shared/errors.ts';
import type { Role } from '#shared/schemas/enums.ts';
import type { User } from '#shared/schemas/users.ts';
import type { Db } from '../db/client.ts';
import { isDatabaseUnavailable } from '../db/errors.ts';
import { findSessionUser } from '../db/queries/users.ts';
import { HttpError } from '../errors.ts';
import { sessionCookie, verifySession } from './session.ts';

declare global {
  // eslint-disable-next-line @typescript-eslint/no-namespace
  namespace Express {
    interface Locals {
      user?: User;
      /**
       * Why there is no user although a cookie came: shapes the 401 message. `database-unavailable`:
       * the session could not be checked; guarded routes answer 503, public ones (health) go on.
       */
      sessionProblem?: 'expired' | 'invalid' | 'disabled' | 'database-unavailable';
      /** Code of the HttpError this request answered with (set by the error middleware). */
      errorCode?: ErrorCode;
    }
  }
}

/**
 * Reads the session cookie on every request; never refuses by itself (allow() does). A token counts
 * when its signature and expiry hold, its user exists and is enabled, and it carries the user's
 * current session generation (sign-out and password, role or status changes raise it).
 */
export function authenticate(db: Db, key: Uint8Array): RequestHandler {
  return async (req: Request, res: Response, next: NextFunction) => {
    const token: unknown = req.cookies?.[sessionCookie];
    if (typeof token !== 'string' || token === '') return next();
    const verified = await verifySession(token, key);
    if (!verified.ok) {
      res.locals.sessionProblem = verified.reason;
      return next();
    }
    let found;
    try {
      found = await findSessionUser(db, verified.userId);
    } catch (err) {
      if (!isDatabaseUnavailable(err)) throw err;
      res.locals.sessionProblem = 'database-unavailable';
      return next();
    }
    if (!found) res.locals.sessionProblem = 'invalid';
    else if (found.user.disabled) res.locals.sessionProblem = 'disabled';
    else if (found.sessionGeneration !== verified.generation) res.locals.sessionProblem = 'expired';
    else res.locals.user = found.user;
    next();
  };
}

/** 401 without a valid session, 403 when the user's role is not among `roles`, 503 when the session cannot be checked. */
export function allow(roles: readonly Role[]): RequestHandler {
  return (_req, res, next) => {
    const user = res.locals.user;
    if (!user) {
      const problem = res.locals.sessionProblem;
      if (problem === 'database-unavailable') throw new HttpError(503, 'database-unavailable');
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
