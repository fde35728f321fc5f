// Element life: which vessels of which site, their element installs and the window — then the pure
// builder in shared/kpi/element-life-report.ts. The forecast (forecast.ts) reads the same input.
import { buildElementLifeReport, type ElementLifeAnswer, type ElementLifeReportInput, type VesselPlace } from '#shared/kpi/element-life-report.ts';
import type { WindowQuery } from '#shared/schemas/common.ts';
import type { ElementLifeQuery } from '#shared/schemas/element-life.ts';
import type { Db } from '../db/client.ts';
import type { AssetRecord } from '../db/queries/assets.ts';
import { listElementInstalls } from '../db/queries/elements.ts';
import { ancestry, queryBounds, resolveSite, scopeOfSite, type KpiScope } from './scope.ts';

/**
 * The scope of an element question and what element life and the forecast are computed from: the
 * vessels in scope with their places, and the element installs in them made before the window's end.
 * Asked of a whole site, the installs need only the site, so they are read alongside the assets.
 */
export async function loadElementInput(db: Db, query: WindowQuery): Promise<{ scope: KpiScope; input: ElementLifeReportInput }> {
  const site = await resolveSite(db, query.site);
  const bounds = queryBounds(query, site.timeZone);
  const [scope, siteInstalls] = await Promise.all([
    scopeOfSite(db, site, query, ['elements']),
    query.asset ? null : listElementInstalls(db.$client, site.id, null, bounds.to),
  ]);
  const places = vesselPlaces(scope);
  if (scope.to === null) return { scope, input: { site: site.code, places, installs: [] } };
  const installs = siteInstalls ?? (await listElementInstalls(db.$client, site.id, [...places.keys()], scope.to));
  return { scope, input: { site: site.code, places, installs: installs.filter((e) => places.has(e.vesselId)) } };
}

/** The vessels of the scope (the asset and everything below it, or the site) with their ancestry. */
export function vesselPlaces(scope: Pick<KpiScope, 'assets' | 'inScope'>): Map<number, VesselPlace> {
  const places = new Map<number, VesselPlace>();
  for (const vessel of scope.inScope) {
    if (vessel.kind !== 'vessel') continue;
    const above = ancestry(scope.assets, vessel);
    const first = (kind: AssetRecord['kind']) => above.find((a) => a.kind === kind)?.code ?? null;
    places.set(vessel.id, { vessel: vessel.code, stage: first('stage'), train: first('train') });
  }
  return places;
}

/** Element life by group over the query's window: `buildElementLifeReport`. */
export async function getElementLife(db: Db, query: ElementLifeQuery): Promise<ElementLifeAnswer> {
  const { scope, input } = await loadElementInput(db, query);
  return buildElementLifeReport(input, { from: scope.from, to: scope.to, confidence: query.confidence, groupBy: query.groupBy });
}
