import { ipKeyGenerator, rateLimit } from 'express-rate-limit';
import { loginBodySchema, meSchema } from '#shared/schemas/users.ts';
import { roles } from '#shared/schemas/enums.ts';
import { currentUser } from '../auth/middleware.ts';
import { sessionCookie, signSession } from '../auth/session.ts';
import type { AppDeps } from '../deps.ts';
import { HttpError } from '../errors.ts';
import { signIn } from '../services/users.ts';
import type { RouteRegistry } from './registry.ts';

export function authRoutes(r: RouteRegistry, { db, env, sessionKey }: AppDeps) {
  // Failed sign-ins per client address and e-mail; a success does not count against the limit.
  const loginLimiter = rateLimit({
    windowMs: env.LOGIN_RATE_WINDOW_MINUTES * 60_000,
    limit: env.LOGIN_RATE_LIMIT,
    skipSuccessfulRequests: true,
    standardHeaders: 'draft-8',
    legacyHeaders: false,
    keyGenerator: (req) => `${ipKeyGenerator(req.ip ?? '')}|${String(req.body?.email ?? '').toLowerCase()}`,
    handler: () => {
      throw new HttpError(429, 'too-many-attempts');
    },
  });

  r.post(
    '/api/auth/login',
    { access: 'public', summary: 'Sign in with e-mail and password; sets the session cookie', body: loginBodySchema, response: meSchema },
    loginLimiter,
    async (req, res) => {
      const body = loginBodySchema.parse(req.body);
      const user = await signIn(db, body.email, body.password);
      const token = await signSession({ userId: user.id, role: user.role }, sessionKey, env.SESSION_HOURS);
      res.cookie(sessionCookie, token, {
        httpOnly: true,
        sameSite: 'strict',
        secure: env.COOKIE_SECURE,
        maxAge: env.SESSION_HOURS * 3600_000,
        path: '/',
      });
      res.json({ user });
    },
  );

  r.post('/api/auth/logout', { access: 'public', summary: 'Sign out: clears the session cookie' }, (_req, res) => {
    res.clearCookie(sessionCookie, { httpOnly: true, sameSite: 'strict', secure: env.COOKIE_SECURE, path: '/' });
    res.status(204).end();
  });

  r.get('/api/auth/me', { access: roles, summary: 'The signed-in user', response: meSchema }, (_req, res) => {
    res.json({ user: currentUser(res) });
  });
}
