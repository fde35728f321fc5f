import type { AppDeps } from '../deps.ts';
import { importRoutes } from './imports.ts';
import { kpiRoutes } from './kpi.ts';
import { reportRoutes } from './reports.ts';
import { mailRoutes } from './mail.ts';
import { nightlyRoutes } from './nightly.ts';
import { siteRoutes } from './sites.ts';
import type { RouteRegistry } from './registry.ts';
import { workOrderRoutes } from './work-orders.ts';

/** Routers of the product's features, registered in one list. */
export function registerFeatureRoutes(r: RouteRegistry, deps: AppDeps): void {
  siteRoutes(r, deps);
  importRoutes(r, deps);
  kpiRoutes(r, deps);
  workOrderRoutes(r, deps);
  reportRoutes(r, deps);
  nightlyRoutes(r, deps);
  mailRoutes(r, deps);
}
