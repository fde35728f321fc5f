import { SignJWT, jwtVerify, errors as joseErrors } from 'jose';
import type { Role } from '#shared/schemas/enums.ts';

export const sessionCookie = 'osmia_session';

export interface SessionClaims {
  userId: number;
  role: Role;
}

export function secretKey(secret: string): Uint8Array {
  return new TextEncoder().encode(secret);
}

export async function signSession(claims: SessionClaims, key: Uint8Array, hours: number): Promise<string> {
  return new SignJWT({ role: claims.role })
    .setProtectedHeader({ alg: 'HS256' })
    .setSubject(String(claims.userId))
    .setIssuedAt()
    .setIssuer('osmia')
    .setExpirationTime(`${Math.round(hours * 3600)}s`)
    .sign(key);
}

export type VerifyResult = { ok: true; userId: number } | { ok: false; reason: 'expired' | 'invalid' };

/** Check signature, issuer and expiry; an expired or tampered token is simply not a session. */
export async function verifySession(token: string, key: Uint8Array): Promise<VerifyResult> {
  try {
    const { payload } = await jwtVerify(token, key, { issuer: 'osmia', algorithms: ['HS256'] });
    const userId = Number(payload.sub);
    if (!Number.isInteger(userId)) return { ok: false, reason: 'invalid' };
    return { ok: true, userId };
  } catch (err) {
    return { ok: false, reason: err instanceof joseErrors.JWTExpired ? 'expired' : 'invalid' };
  }
}
