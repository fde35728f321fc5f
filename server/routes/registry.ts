import { Router, type RequestHandler } from 'express';
import type { ZodType } from 'zod';
import type { Role } from '#shared/schemas/enums.ts';
import { allow } from '../auth/middleware.ts';

/** Who may call a route: everyone (no session needed) or the listed roles. */
export type Access = 'public' | readonly Role[];
export type Method = 'get' | 'post' | 'put' | 'patch' | 'delete';

export interface RouteSpec {
  method: Method;
  /** Express path as mounted, e.g. /api/users/:id */
  path: string;
  access: Access;
  summary: string;
  query?: ZodType;
  params?: ZodType;
  body?: ZodType;
  response?: ZodType;
  /** Non-JSON answers (CSV, XLSX) name their media type. */
  produces?: string;
}

type Options = Omit<RouteSpec, 'method' | 'path'>;

/**
 * The one place where each route declares the roles it admits. Every route goes through here, so
 * the route × role test table and the OpenAPI document see exactly what the router serves.
 */
export class RouteRegistry {
  readonly routes: RouteSpec[] = [];
  readonly router = Router();

  private add(method: Method) {
    return (path: string, options: Options, ...handlers: RequestHandler[]) => {
      this.routes.push({ method, path, ...options });
      const guard = options.access === 'public' ? [] : [allow(options.access)];
      this.router[method](path, ...guard, ...handlers);
    };
  }

  get = this.add('get');
  post = this.add('post');
  put = this.add('put');
  patch = this.add('patch');
  delete = this.add('delete');
}
