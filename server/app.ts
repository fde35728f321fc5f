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

function errorBody(code: HttpError['code'], message: string, details?: unknown): ErrorBody {
  return { error: { code, message, ...(details === undefined ? {} : { details }) } };
}

/** Builds the Express app without listening (server/index.ts listens; tests use supertest). */
export function createApp(deps: AppDeps, options: AppOptions = {}): Express & { locals: { routes: RouteRegistry['routes'] } } {
  const log = options.log ?? ((line: string) => console.error(line));
  const app = express();
  app.disable('x-powered-by');
  app.set('trust proxy', 'loopback');
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
      res.status(err.status).json(errorBody(err.code, err.message, err.details));
    } else if (err instanceof ZodError) {
      res.status(400).json(errorBody('validation-failed', messageFor('validation-failed'), { issues: err.issues }));
    } else if (err?.type === 'entity.parse.failed') {
      const issues = [{ code: 'invalid_json', path: [], message: String(err.message) }];
      res.status(400).json(errorBody('invalid-json', messageFor('invalid-json'), { issues }));
    } else if (err?.type === 'entity.too.large') {
      res.status(413).json(errorBody('file-too-large', 'The request body is too large.'));
    } else {
      log(`[${String(res.locals.requestId)}] ${err?.stack ?? String(err)}`);
      res.status(500).json(errorBody('internal-error', messageFor('internal-error')));
    }
  };
  app.use(onError);
  return app as Express & { locals: { routes: RouteRegistry['routes'] } };
}
