// Downtime KPI (docs/design.md §6, §7): the rows the answer is built from — the scope, the run-status rows
// of the tags that stand for the assets in it (read in run-status.ts, shared with reliability) and the
// work orders — then `buildDowntimeReport` (shared/kpi/downtime-report.ts) applies the rules.
import { buildDowntimeReport, downtimeRunTags, type DowntimeReportInput } from '#shared/kpi/downtime-report.ts';
import type { BeforeFreshness } from '#shared/schemas/common.ts';
import type { DowntimeQuery, DowntimeReport } from '#shared/schemas/downtime.ts';
import type { Settings } from '#shared/schemas/settings.ts';
import type { Db } from '../db/client.ts';
import { listTags } from '../db/queries/tags.ts';
import { listWorkOrdersReportedOrOutOfServiceIn } from '../db/queries/work-orders.ts';
import { loadRunStatusRows } from './run-status.ts';
import { resolveScope } from './scope.ts';
import { workOrderRecords } from './work-orders.ts';

/** The downtime answer as the service computes it: exactly the schema's type, before freshness. */
export type DowntimeAnswer = BeforeFreshness<DowntimeReport>;

/**
 * What the downtime answer over [from, to) is built from (`DowntimeReportInput`): the site's assets and
 * tags, the run-status rows of the tag that stands for each asset in scope (`downtimeRunTags`), and the
 * work orders on the assets in scope reported in the window or out of service during it. A site with no
 * data to bound a window reads nothing more than its scope.
 */
export async function loadDowntimeInput(db: Db, query: DowntimeQuery): Promise<{ input: DowntimeReportInput; from: Date | null; to: Date | null }> {
  const { site, assets, inScope, from, to } = await resolveScope(db, query);
  const input: DowntimeReportInput = { site: site.code, assets, inScope, tags: [], runStatus: new Map(), workOrders: [] };
  if (!from || !to) return { input, from, to };
  const tags = await listTags(db.$client, site.id);
  const { runTags } = downtimeRunTags(tags, inScope);
  const runStatus = await loadRunStatusRows(db, [...runTags.values()], from, to);
  const orders = await listWorkOrdersReportedOrOutOfServiceIn(
    db.$client,
    site.id,
    inScope.map((a) => a.id),
    from,
    to,
  );
  return { input: { ...input, tags, runStatus, workOrders: workOrderRecords(orders, assets) }, from, to };
}

/** Downtime for the asset asked about and everything below it: `loadDowntimeInput`, then `buildDowntimeReport`. */
export async function getDowntime(db: Db, query: DowntimeQuery, settings: Settings): Promise<DowntimeAnswer> {
  const { input, from, to } = await loadDowntimeInput(db, query);
  // The service may read the clock; shared/ may not. Only a site without data needs it.
  return buildDowntimeReport(input, { from, to, now: new Date() }, settings);
}
