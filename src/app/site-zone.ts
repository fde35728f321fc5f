import type { QueryClient } from '@tanstack/react-query';
import type { Site } from '#shared/schemas/sites.ts';
import { sitesQueryOptions } from '../features/sites/api/get-sites.ts';
import { setDisplayTimeZone } from '../lib/format.ts';

/** The site a page is about: the one its address names, else the only one; null when that is not clear. */
export function siteOfPage(sites: readonly Site[], url: URL): Site | null {
  const code = url.searchParams.get('site')?.trim().toLowerCase();
  if (code) return sites.find((s) => s.code.toLowerCase() === code) ?? null;
  return sites.length === 1 ? sites[0]! : null;
}

/**
 * Show the pages' dates in the zone of the site they are about (see setDisplayTimeZone). Never throws:
 * without the site list, dates stay in the browser's zone.
 */
export async function showZoneOfPage(queryClient: QueryClient, request: Request): Promise<void> {
  const sites = await queryClient.ensureQueryData(sitesQueryOptions).catch(() => [] as Site[]);
  setDisplayTimeZone(siteOfPage(sites, new URL(request.url))?.timeZone);
}
