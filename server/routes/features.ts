import type { AppDeps } from '../deps.ts';
import type { RouteRegistry } from './registry.ts';

/** Routers of the feature issues (imports, KPIs, reports) register here, in one list. */
export function registerFeatureRoutes(_r: RouteRegistry, _deps: AppDeps): void {}
