// Reliability KPI (docs/design.md §6, §7): the scope, window and rows the answer needs — assets, tags,
// work orders, run-status histories — then the pure builder in shared/kpi/reliability-report.ts.
import {
  buildReliabilityReport,
  operatingTimeTags,
  type ReliabilityAnswer,
  type ReliabilityReportInput,
  type ReliabilityWindow,
} from '#shared/kpi/reliability-report.ts';
import type { ReliabilityQuery } from '#shared/schemas/reliability.ts';
import type { Db } from '../db/client.ts';
import { listTags } from '../db/queries/tags.ts';
import { listWorkOrdersReportedOrOutOfServiceIn } from '../db/queries/work-orders.ts';
import { loadRunStatusHistories } from './run-status.ts';
import { resolveScope } from './scope.ts';

/**
 * What a reliability answer is computed from: the scope and window of the query (scope.ts), and — when
 * there is a window — the site's tags, the work orders on assets in scope reported in the window or out
 * of service during it, and the run-status history (derived tables only: run-status.ts) of each tag that
 * gives an asset in scope its operating time.
 */
export async function loadReliabilityInput(db: Db, query: ReliabilityQuery): Promise<{ input: ReliabilityReportInput; window: ReliabilityWindow }> {
  const { site, assets, asset, inScope, from, to } = await resolveScope(db, query);
  const window: ReliabilityWindow = { from, to, confidence: query.confidence, groupBy: query.groupBy };
  const input: ReliabilityReportInput = { site: site.code, assets, asset, inScope, tags: [], workOrders: [], histories: new Map(), historyNotes: [] };
  if (!from || !to) return { input, window };
  const tags = await listTags(db.$client, site.id);
  const workOrders = await listWorkOrdersReportedOrOutOfServiceIn(db.$client, site.id, inScope.map((a) => a.id), from, to);
  const { histories, notes } = await loadRunStatusHistories(db, operatingTimeTags(assets, inScope, tags), from, to);
  return { input: { ...input, tags, workOrders, histories, historyNotes: notes }, window };
}

/** Reliability of the asset asked about and everything below it, or of the whole site: `buildReliabilityReport`. */
export async function getReliability(db: Db, query: ReliabilityQuery): Promise<ReliabilityAnswer> {
  const { input, window } = await loadReliabilityInput(db, query);
  return buildReliabilityReport(input, window);
}
