// `osmia kpi downtime`: the stops, totals per asset and the Pareto tables, lost volume in m³ and cost.
import type { DowntimeReport } from '#shared/schemas/downtime.ts';
import { formatNumber, formatTable } from '../output.ts';

/** Most stop rows printed; `--json` gives them all. */
export const MAX_EVENT_ROWS = 50;

const percent = (share: number) => `${formatNumber(share * 100, 1)} %`;

/**
 * A plain-text downtime report: the stops (at most MAX_EVENT_ROWS, the count of the rest), totals per asset,
 * Pareto tables by cause and by asset, then notes. Hours in h, lost volume in m³, cost in the plant's currency.
 */
export function formatDowntime(
  report: DowntimeReport,
): string {
  const currency = report.currency ?? '';
  const lines: string[] = [
    `Downtime${report.site ? ` — site ${report.site}` : ''}, ${report.from} to ${report.to}` +
      `${report.waterValuePerM3 === null ? '' : `; water value ${formatNumber(report.waterValuePerM3)} ${currency}/m³`}`,
  ];
  if (report.events.length === 0) lines.push('No stops in the window.');
  else {
    const shown = report.events.slice(0, MAX_EVENT_ROWS);
    lines.push(
      formatTable(
        ['asset', 'from', 'to', 'hours (h)', 'planned', 'cause', 'lost volume (m³)', `cost (${currency})`],
        shown.map((e) => [
          e.asset,
          e.from + (e.clippedAtStart ? ' (cut)' : ''),
          e.to + (e.clippedAtEnd ? ' (cut)' : ''),
          e.hours,
          e.planned ? `yes (${e.plannedBy.join(', ')})` : 'no',
          e.causeWorkOrder ? `${e.cause} (${e.causeWorkOrder})` : e.cause,
          e.lostVolumeM3,
          e.cost,
        ]),
      ),
    );
    if (report.events.length > shown.length) lines.push(`… and ${report.events.length - shown.length} more stop(s): use --json for all.`);
  }
  if (report.totals.length > 0) {
    lines.push('Totals per asset:');
    lines.push(
      formatTable(
        ['asset', 'stops', 'hours (h)', 'planned (h)', 'unplanned (h)', 'rated permeate (m³/h)', 'lost volume (m³)', `cost (${currency})`],
        report.totals.map((t) => [
          t.asset,
          t.events,
          t.hours,
          t.plannedHours,
          t.unplannedHours,
          t.ratedPermeateM3h === null ? null : `${formatNumber(t.ratedPermeateM3h)}${t.ratedPermeateFrom && t.ratedPermeateFrom !== t.asset ? ` (of ${t.ratedPermeateFrom})` : ''}`,
          t.lostVolumeM3,
          t.cost,
        ]),
      ),
    );
  }
  for (const [title, rows] of [
    ['Pareto by cause:', report.paretoByCause],
    ['Pareto by asset:', report.paretoByAsset],
  ] as const) {
    if (rows.length === 0) continue;
    lines.push(title);
    lines.push(
      formatTable(
        ['key', 'stops', 'hours (h)', 'share', 'cumulative', 'lost volume (m³)', `cost (${currency})`],
        rows.map((r) => [r.key, r.events, r.hours, percent(r.share), percent(r.cumulativeShare), r.lostVolumeM3, r.cost]),
      ),
    );
  }
  for (const note of report.notes) lines.push(`Note: ${note}`);
  return lines.join('\n');
}
