import { ipKeyGenerator, rateLimit } from 'express-rate-limit';
import type { Request } from 'express';
import { emailSchema, loginBodySchema, meSchema, meUpdateBodySchema } from '#shared/schemas/users.ts';
import { roles } from '#shared/schemas/enums.ts';
import { clearSession, issueSession } from '../auth/cookie.ts';
import { currentUser } from '../auth/middleware.ts';
import { endUserSessions } from '../db/queries/users.ts';
import type { AppDeps } from '../deps.ts';
import { HttpError } from '../errors.ts';
import { changeOwnAccount, signIn } from '../services/users.ts';
import type { RouteRegistry } from './registry.ts';

/**
 * The rate limit's key: the client address as Express sees it (the socket's, or the one a trusted
 * proxy forwarded: TRUST_PROXY) and the e-mail as sign-in reads it, trimmed and case-folded, so
 * " User@X " and "user@x" share one count.
 */
function loginKey(req: Request): string {
  const raw: unknown = (req.body as { email?: unknown } | undefined)?.email;
  const email = emailSchema.safeParse(raw);
  const normalised = email.success ? email.data : typeof raw === 'string' ? raw.trim().toLowerCase() : JSON.stringify(raw ?? null);
  return `${ipKeyGenerator(req.ip ?? '')}|${normalised}`;
}

export function authRoutes(r: RouteRegistry, { db, env, sessionKey }: AppDeps) {
  // Wrong passwords per client address and e-mail. Only they count: a sign-in that succeeds, input
  // refused by the schema and a database outage (503) take nothing from the allowance.
  const loginLimiter = rateLimit({
    windowMs: env.LOGIN_RATE_WINDOW_MINUTES * 60_000,
    limit: env.LOGIN_RATE_LIMIT,
    skipSuccessfulRequests: true,
    requestWasSuccessful: (_req, res) => res.locals.errorCode !== 'invalid-credentials',
    standardHeaders: 'draft-8',
    legacyHeaders: false,
    keyGenerator: loginKey,
    // With TRUST_PROXY off an X-Forwarded-For header is simply not believed; the library's warning
    // about it would put one log line per such request in the server log, for any client to cause.
    validate: { xForwardedForHeader: false },
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
      const { user, sessionGeneration } = await signIn(db, body.email, body.password);
      await issueSession(req, res, env, sessionKey, { userId: user.id, role: user.role, generation: sessionGeneration });
      res.json({ user });
    },
  );

  r.post('/api/auth/logout', { access: 'public', summary: 'Sign out: ends every session of the user and clears the cookie' }, async (req, res) => {
    const user = res.locals.user;
    if (user) await endUserSessions(db, user.id);
    clearSession(req, res, env);
    res.status(204).end();
  });

  r.get('/api/auth/me', { access: roles, summary: 'The signed-in user', response: meSchema }, (_req, res) => {
    res.json({ user: currentUser(res) });
  });

  r.patch(
    '/api/auth/me',
    { access: roles, summary: 'Change one’s own account: subscribe to the nightly digest or leave it', body: meUpdateBodySchema, response: meSchema },
    async (req, res) => {
      const body = meUpdateBodySchema.parse(req.body);
      res.json({ user: await changeOwnAccount(db, currentUser(res).id, body) });
    },
  );
}
