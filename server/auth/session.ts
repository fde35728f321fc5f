import { SignJWT, jwtVerify, errors as joseErrors } from 'jose';
import type { Role } from '#shared/schemas/enums.ts';

export const sessionCookie = 'osmia_session';

export interface SessionClaims {
  userId: number;
  role: Role;
  /**
   * The user's session generation when the token was signed (users.session_generation). Sign-out,
   * a password or role change and disabling the account raise it, which ends every earlier token.
   */
  generation: number;
}

export function secretKey(secret: string): Uint8Array {
  return new TextEncoder().encode(secret);
}

export async function signSession(claims: SessionClaims, key: Uint8Array, hours: number): Promise<string> {
  return new SignJWT({ role: claims.role, gen: claims.generation })
    .setProtectedHeader({ alg: 'HS256' })
    .setSubject(String(claims.userId))
    .setIssuedAt()
    .setIssuer('osmia')
    .setExpirationTime(`${Math.round(hours * 3600)}s`)
    .sign(key);
}

export type VerifyResult = { ok: true; userId: number; generation: number } | { ok: false; reason: 'expired' | 'invalid' };

/** Check signature, issuer and expiry; an expired or tampered token is simply not a session. */
export async function verifySession(token: string, key: Uint8Array): Promise<VerifyResult> {
  try {
    const { payload } = await jwtVerify(token, key, { issuer: 'osmia', algorithms: ['HS256'] });
    const userId = Number(payload.sub);
    const generation = payload.gen;
    // A token without a generation predates it: it cannot be checked, so it is not a session.
    if (!Number.isInteger(userId) || typeof generation !== 'number' || !Number.isInteger(generation)) return { ok: false, reason: 'invalid' };
    return { ok: true, userId, generation };
  } catch (err) {
    return { ok: false, reason: err instanceof joseErrors.JWTExpired ? 'expired' : 'invalid' };
  }
}
