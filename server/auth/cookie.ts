import type { Request, Response } from 'express';
import type { Env } from '../env.ts';
import { sessionCookie, signSession, type SessionClaims } from './session.ts';

/**
 * Secure when COOKIE_SECURE says so, or when this request came over HTTPS: directly, or through a
 * proxy that TRUST_PROXY names (its X-Forwarded-Proto is believed only then).
 */
const cookieOptions = (req: Request, env: Env) =>
  ({ httpOnly: true, sameSite: 'strict', secure: env.COOKIE_SECURE || req.secure, path: '/' }) as const;

/** Sign a session token and set it as the session cookie. */
export async function issueSession(req: Request, res: Response, env: Env, key: Uint8Array, claims: SessionClaims): Promise<void> {
  const token = await signSession(claims, key, env.SESSION_HOURS);
  res.cookie(sessionCookie, token, { ...cookieOptions(req, env), maxAge: env.SESSION_HOURS * 3600_000 });
}

export function clearSession(req: Request, res: Response, env: Env): void {
  res.clearCookie(sessionCookie, cookieOptions(req, env));
}
