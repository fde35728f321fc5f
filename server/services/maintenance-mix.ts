// Maintenance mix: the work orders of the scope and window and the permeate the trains produced (hourly
// rollups of permeate-flow tags) — then `buildMaintenanceMixReport` (shared/kpi/maintenance-mix-report.ts)
// applies the rules, with the crews' weekly capacity from the settings.
import {
  buildMaintenanceMixReport,
  maintenanceMixWindow,
  permeateTags,
  productionTrains,
  type MaintenanceMixReportInput,
} from '#shared/kpi/maintenance-mix-report.ts';
import type { BeforeFreshness } from '#shared/schemas/common.ts';
import type { MaintenanceMixQuery, MaintenanceMixReport } from '#shared/schemas/maintenance-mix.ts';
import type { Settings } from '#shared/schemas/settings.ts';
import type { Db } from '../db/client.ts';
import { integrateHourlyMeans } from '../db/queries/sample-hourly.ts';
import { listTags } from '../db/queries/tags.ts';
import { listWorkOrdersOpenDuring } from '../db/queries/work-orders.ts';
import { resolveScope } from './scope.ts';
import { workOrderRecords } from './work-orders.ts';

/**
 * What the maintenance mix over the window (`maintenanceMixWindow`) is built from: the work orders on the
 * assets in scope open at some time in it, and the hourly integrals of the trains' permeate tags — read
 * only when every train the scope produces with (`productionTrains`) has one (`permeateTags`).
 */
export async function loadMaintenanceMixInput(
  db: Db,
  query: MaintenanceMixQuery,
  now: Date,
): Promise<{ input: MaintenanceMixReportInput; from: Date | null; to: Date | null }> {
  const scope = await resolveScope(db, query);
  const { from, to } = maintenanceMixWindow({ from: scope.from, to: scope.to, now });
  const orders = await listWorkOrdersOpenDuring(
    db.$client,
    scope.site.id,
    scope.inScope.map((a) => a.id),
    from,
    to,
  );
  const trains = productionTrains(scope);
  const tags = trains.length > 0 ? await listTags(db.$client, scope.site.id) : [];
  const { missing, used } = permeateTags(trains, scope.assets, tags);
  const permeate = trains.length > 0 && missing.length === 0 ? await integrateHourlyMeans(db.$client, used.map((t) => t.id), from, to) : [];
  const input: MaintenanceMixReportInput = {
    site: scope.site.code,
    assets: scope.assets,
    asset: scope.asset,
    inScope: scope.inScope,
    workOrders: workOrderRecords(orders, scope.assets),
    tags,
    permeate,
  };
  return { input, from: scope.from, to: scope.to };
}

/** Maintenance mix over [from, to) for the asset asked about and everything below it: `loadMaintenanceMixInput`, then `buildMaintenanceMixReport`. */
export async function getMaintenanceMix(db: Db, query: MaintenanceMixQuery, settings: Settings): Promise<BeforeFreshness<MaintenanceMixReport>> {
  // The service may read the clock; shared/ may not. Without any data there is no other bound.
  const now = new Date();
  const { input, from, to } = await loadMaintenanceMixInput(db, query, now);
  return buildMaintenanceMixReport(input, { from, to, now, cancelledPmCountsAsMissed: query.cancelledPmCountsAsMissed }, settings);
}
