// Which site, asset and window a KPI question is about: the part every KPI service shares.
import type { WindowQuery } from '#shared/schemas/common.ts';
import type { Db } from '../db/client.ts';
import { listAssets, type AssetRecord } from '../db/queries/assets.ts';
import { findSite, listSites, type SiteRow } from '../db/queries/sites.ts';
import { HttpError, badRequest, notFound } from '../errors.ts';
import { TimestampReader } from '#shared/timestamps.ts';
import { subtree } from '#shared/kpi/asset-tree.ts';

export interface KpiScope {
  site: SiteRow;
  /** All assets of the site. */
  assets: AssetRecord[];
  /** The asset asked about, if any. */
  asset: AssetRecord | null;
  /** The asset and every asset below it (the whole site without an asset). */
  inScope: AssetRecord[];
  /** Half-open window [from, to); null bounds when the site has no data at all. */
  from: Date | null;
  to: Date | null;
}

export { ancestry, subtree } from '#shared/kpi/asset-tree.ts';

/** A window bound: an instant with offset as is; a bare date or naive date-time in the site's zone. */
export function resolveBound(text: string, timeZone: string): Date {
  const r = new TimestampReader(timeZone).read(text.length === 10 ? `${text}T00:00:00` : text);
  if (!r.ok) throw badRequest('invalid-window', r.reason);
  return new Date(r.value);
}

/** What a KPI is computed from, for its default window: the whole range of that data. */
export type DataSource = 'samples' | 'work-orders' | 'elements';

const extentSql: Record<DataSource, string> = {
  samples: `select min(c.from_ts) f, max(c.to_ts) + interval '1 second' t from sample_coverage c join tags g on g.id = c.tag_id where g.site_id = $1`,
  'work-orders': `select min(reported_at), max(greatest(reported_at, completed_at, out_of_service_to)) + interval '1 second' from work_orders where site_id = $1`,
  elements: `select min(installed_at), max(greatest(installed_at, removed_at)) + interval '1 second' from elements where site_id = $1`,
};

/**
 * The extent of a site's data of the given kinds. A KPI of the historian and work orders defaults to
 * their range, not to an element register that may go back to commissioning.
 */
export async function dataExtent(db: Db, siteId: number, sources: readonly DataSource[]): Promise<{ from: Date | null; to: Date | null }> {
  const { rows } = await db.$client.query<{ from: Date | null; to: Date | null }>(
    `select min(f) as "from", max(t) as "to" from (${sources.map((s) => extentSql[s]).join(' union all ')}) x(f, t)`,
    [siteId],
  );
  return rows[0] ?? { from: null, to: null };
}

/**
 * The site a KPI question or an import is about: the one named, or the only one there is. The one place
 * a site code is resolved; its errors (HttpError `site-not-found`, `site-required`) say what to do.
 */
export async function resolveSite(db: Db, code: string | undefined): Promise<SiteRow> {
  if (code) {
    const site = await findSite(db.$client, code);
    if (!site) throw notFound('site-not-found', `Site "${code}" does not exist: import its asset register first (bin/osmia import assets FILE --site ${code} --tz ZONE).`);
    return site;
  }
  const sites = await listSites(db.$client);
  if (sites.length === 1) return sites[0];
  if (sites.length === 0) throw notFound('site-not-found', 'No site exists yet: import an asset register first, naming the site (--site CODE, and --tz ZONE).');
  throw new HttpError(400, 'site-required', `Several sites exist (${sites.map((s) => s.code).join(', ')}): name one with site (--site on the command line).`);
}

export async function resolveScope(
  db: Db,
  query: WindowQuery,
  sources: readonly DataSource[] = ['samples', 'work-orders'],
): Promise<KpiScope> {
  return scopeOfSite(db, await resolveSite(db, query.site), query, sources);
}

/** The bounds the query gives, in the site's zone (null where it gives none); refuses an empty window. */
export function queryBounds(query: WindowQuery, timeZone: string): { from: Date | null; to: Date | null } {
  const from = query.from ? resolveBound(query.from, timeZone) : null;
  const to = query.to ? resolveBound(query.to, timeZone) : null;
  checkWindow(from, to);
  return { from, to };
}

function checkWindow(from: Date | null, to: Date | null): void {
  if (from && to && from >= to) throw badRequest('invalid-window', `The window is empty: from (${from.toISOString()}) is not before to (${to.toISOString()}).`);
}

/** `resolveScope` for a site already found, so a caller can start site-wide reads alongside it. */
export async function scopeOfSite(db: Db, site: SiteRow, query: WindowQuery, sources: readonly DataSource[]): Promise<KpiScope> {
  const given = queryBounds(query, site.timeZone);
  const needExtent = sources.length > 0 && !(query.from && query.to);
  const [assets, extent] = await Promise.all([
    listAssets(db.$client, site.id),
    needExtent ? dataExtent(db, site.id, sources) : { from: null, to: null },
  ]);
  let asset: AssetRecord | null = null;
  if (query.asset) {
    asset = assets.find((a) => a.code.toLowerCase() === query.asset!.toLowerCase()) ?? null;
    if (!asset) throw notFound('asset-not-found', `No asset "${query.asset}" on site ${site.code}.`);
  }
  const from = query.from ? given.from : extent.from;
  const to = query.to ? given.to : extent.to;
  checkWindow(from, to);
  return { site, assets, asset, inScope: asset ? subtree(assets, asset) : assets, from, to };
}
