import { randomUUID } from 'node:crypto';
import { existsSync } from 'node:fs';
import { join } from 'node:path';
import compression from 'compression';
import cookieParser from 'cookie-parser';
import express, { type ErrorRequestHandler, type Express } from 'express';
import helmet from 'helmet';
import { ZodError } from 'zod';
import { messageFor } from '#shared/errors.ts';
import type { ErrorBody } from '#shared/schemas/error.ts';
import { authenticate } from './auth/middleware.ts';
import { describeErrorForLog, isDatabaseUnavailable } from './db/errors.ts';
import type { AppDeps } from './deps.ts';
import { HttpError } from './errors.ts';
import { authRoutes } from './routes/auth.ts';
import { healthRoutes } from './routes/health.ts';
import { openApiRoutes } from './routes/openapi.ts';
import { RouteRegistry } from './routes/registry.ts';
import { settingsRoutes } from './routes/settings.ts';
import { userRoutes } from './routes/users.ts';
import { registerFeatureRoutes } from './routes/features.ts';

export interface AppOptions {
  /** Folder of the built client (vite build); when set and present, served with an SPA fallback. */
  clientDist?: string;
  log?: (line: string) => void;
}

/** What a 503 database-unavailable asks clients to wait before trying again. */
const retryAfterSeconds = '30';

function errorBody(code: HttpError['code'], message: string, details?: unknown): ErrorBody {
  return { error: { code, message, ...(details === undefined ? {} : { details }) } };
}

/** Builds the Express app without listening (server/index.ts listens; tests use supertest). */
export function createApp(deps: AppDeps, options: AppOptions = {}): Express & { locals: { routes: RouteRegistry['routes'] } } {
  const log = options.log ?? ((line: string) => console.error(line));
  const app = express();
  app.disable('x-powered-by');
  // Off unless TRUST_PROXY names the proxy: otherwise any client could choose its address (the
  // sign-in rate limit's key) with an X-Forwarded-For header of its own.
  app.set('trust proxy', deps.env.TRUST_PROXY);
  app.use(
    helmet({
      contentSecurityPolicy: {
        directives: { 'img-src': ["'self'", 'data:'], 'style-src': ["'self'", "'unsafe-inline'"], 'upgrade-insecure-requests': null },
      },
    }),
  );
  app.use((req, res, next) => {
    const id = randomUUID();
    res.locals.requestId = id;
    res.setHeader('X-Request-Id', id);
    if (deps.env.LOG_REQUESTS) res.on('finish', () => log(`${req.method} ${req.originalUrl} ${res.statusCode} ${id}`));
    next();
  });
  app.use(compression());
  app.use(express.json({ limit: '1mb' }));
  app.use(cookieParser());
  app.use('/api', authenticate(deps.db, deps.sessionKey));

  const registry = new RouteRegistry();
  healthRoutes(registry, deps);
  authRoutes(registry, deps);
  userRoutes(registry, deps);
  settingsRoutes(registry, deps);
  registerFeatureRoutes(registry, deps);
  openApiRoutes(registry);
  app.use(registry.router);
  app.locals.routes = registry.routes;

  app.all('/api/{*rest}', (req) => {
    throw new HttpError(404, 'route-not-found', `No API route for ${req.method} ${req.path}`);
  });

  if (options.clientDist && existsSync(join(options.clientDist, 'index.html'))) {
    const dist = options.clientDist;
    app.use(express.static(dist, { index: false, maxAge: '1h' }));
    app.get('/{*splat}', (_req, res) => {
      res.setHeader('Cache-Control', 'no-cache');
      res.sendFile(join(dist, 'index.html'));
    });
  }

  const onError: ErrorRequestHandler = (err, _req, res, next) => {
    if (res.headersSent) return next(err);
    if (err instanceof HttpError) {
      res.locals.errorCode = err.code;
      if (err.code === 'database-unavailable') res.setHeader('Retry-After', retryAfterSeconds);
      res.status(err.status).json(errorBody(err.code, err.message, err.details));
    } else if (err instanceof ZodError) {
      res.status(400).json(errorBody('validation-failed', messageFor('validation-failed'), { issues: err.issues }));
    } else if (err?.type === 'entity.parse.failed') {
      const issues = [{ code: 'invalid_json', path: [], message: String(err.message) }];
      res.status(400).json(errorBody('invalid-json', messageFor('invalid-json'), { issues }));
    } else if (err?.type === 'entity.too.large') {
      res.status(413).json(errorBody('file-too-large', 'The request body is too large.'));
    } else if (isDatabaseUnavailable(err)) {
      // Not a bug of ours: one line (no stack) so an outage does not bury the log.
      log(`[${String(res.locals.requestId)}] database unavailable: ${describeErrorForLog(err).split('\n').filter((l) => !l.startsWith('    at ')).join(' | ')}`);
      res.locals.errorCode = 'database-unavailable';
      res.setHeader('Retry-After', retryAfterSeconds);
      res.status(503).json(errorBody('database-unavailable', messageFor('database-unavailable')));
    } else {
      log(`[${String(res.locals.requestId)}] ${describeErrorForLog(err)}`);
      res.status(500).json(errorBody('internal-error', messageFor('internal-error')));
    }
  };
  app.use(onError);
  return app as Express & { locals: { routes: RouteRegistry['routes'] } };
}
