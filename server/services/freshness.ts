// Freshness of KPI answers (docs/design.md §6, freshness). Imports rebuild what is derived
// from samples before they report success; whatever still lags — a bulk load with --no-refresh, a
// refresh that failed, another process refreshing right now — is either rebuilt before the answer
// (when that is quick) or named in the answer's `warnings`, with the command that fixes it.
import type { Freshness } from '#shared/schemas/common.ts';
import { countOf } from '#shared/text.ts';
import type { Db } from '../db/client.ts';
import { dataVersionAndSettings } from '../db/queries/data-version.ts';
import { derivedLag, newestData } from '../db/queries/freshness.ts';
import { refresh } from '../jobs/refresh.ts';

/**
 * Up to this many tag-hours waiting, a KPI request rebuilds them itself before it answers: about one
 * second on a 2-core machine (a full rebuild of 20 M samples, ~1.6 M tag-hours, took 38 s; one day of
 * 40 tags, 960 tag-hours, 26 ms — README, Benchmarks). Beyond it the answer says what to run instead
 * of keeping the reader waiting for a bulk load's rebuild.
 */
export const inlineRefreshTagHours = 40_000;

/** One inline refresh at a time in this process; concurrent requests wait for the same one. */
let inlineRefresh: Promise<unknown> | null = null;

/**
 * Rebuild lagging derived rows before a KPI that reads them answers, when there are few enough of them
 * (`lagTagHours`, all sites, from the data-version read; read here when not given). Returns true when
 * it refreshed, so the caller reads the data version again. A failed refresh is not this request's
 * error: the answer then says the data lags.
 */
export async function catchUpDerived(db: Db, lagTagHours?: number): Promise<boolean> {
  lagTagHours ??= (await dataVersionAndSettings(db.$client)).lagTagHours;
  if (lagTagHours <= 0 || lagTagHours > inlineRefreshTagHours) return false;
  inlineRefresh ??= refresh(db)
    .catch(() => undefined)
    .finally(() => (inlineRefresh = null));
  await inlineRefresh;
  return true;
}

/**
 * The freshness fields of an answer about `site` whose window ends at `to` (or whose figures are as of
 * it): newest sample and work-order time up to there, whether the derived tables of the site are
 * current, and a warning naming `bin/osmia refresh` when they are not. A KPI that reads no derived
 * table (`readsDerived` false) is up to date by definition.
 */
export async function freshnessOf(db: Db, site: string | undefined, to: string | null | undefined, readsDerived: boolean): Promise<Freshness> {
  if (!site) return { dataAsOf: { newestSampleAt: null, newestWorkOrderAt: null }, derivedUpToDate: true, warnings: [] };
  const until = to ? new Date(to) : null;
  const [newest, lag] = await Promise.all([newestData(db.$client, site, until), readsDerived ? derivedLag(db.$client, site) : null]);
  const warnings: string[] = [];
  const upToDate = lag === null || lag.tags === 0;
  if (!upToDate) {
    warnings.push(
      `Samples imported for ${countOf(lag.tags, 'tag', 'tags')} of ${site} are not yet in the hourly rollups and stop events ` +
        `(${Math.ceil(lag.tagHours).toLocaleString('en')} ${Math.ceil(lag.tagHours) === 1 ? 'tag-hour' : 'tag-hours'} to rebuild): stops, operating time, produced volume and ` +
        `performance may be missing or out of date. Run "bin/osmia refresh", then ask again.`,
    );
  }
  return {
    dataAsOf: { newestSampleAt: newest.sample?.toISOString() ?? null, newestWorkOrderAt: newest.workOrder?.toISOString() ?? null },
    derivedUpToDate: upToDate,
    warnings,
  };
}
