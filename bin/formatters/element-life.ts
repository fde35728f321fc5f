// `osmia kpi element-life`: one row per group with the Weibull fit and the life figures in days.
import { nullReasonMessages } from '#shared/kpi/stats.ts';
import type { ElementLifeReport } from '#shared/schemas/element-life.ts';
import { formatNumber, formatTable } from '../output.ts';

/**
 * A plain-text report of element life: window, one row per group, why any figure is missing, then how
 * lives crossing the window's edges were treated (the answer's own sentence when it gives one).
 */
export function formatElementLife(report: ElementLifeReport): string {
  const lines: string[] = [];
  const confidence = report.confidence ?? 0.9;
  lines.push(
    `Element life${report.site ? ` — site ${report.site}` : ''}, grouped by ${report.groupBy ?? 'all'}` +
      `${report.from && report.to ? `, lives in service from ${report.from} to ${report.to}` : ''}`,
  );
  const pct = formatNumber(confidence * 100, 1);
  lines.push(
    formatTable(
      ['group', 'n', 'events', 'shape β', `β ${pct}% interval`, 'scale η (d)', 'B10 (d)', 'median (d)', 'mean (d)', 'KM median (d)'],
      report.groups.map((g) => [
        g.key,
        g.n,
        g.events,
        // Shape to three decimals (a string, so the table does not round it to two).
        g.weibull ? formatNumber(g.weibull.shape, 3) : null,
        g.weibull?.shapeLower === undefined ? null : `${formatNumber(g.weibull.shapeLower)}–${g.weibull.shapeUpper == null ? '∞' : formatNumber(g.weibull.shapeUpper)}`,
        g.weibull?.scaleDays ?? null,
        g.b10Days,
        g.medianDays,
        g.meanDays,
        g.kmMedianDays ?? null,
      ]),
    ),
  );
  const missing = report.groups.flatMap((g) => {
    const reason = g.reasons?.['weibull'];
    return g.weibull === null && reason ? [`${g.key}: no Weibull fit — ${nullReasonMessages[reason]}`] : [];
  });
  if (missing.length > 0) lines.push(...missing);
  lines.push(report.windowTreatment?.text ?? 'Lives still in service at the window end are censored there.');
  for (const note of report.notes ?? []) if (note !== report.windowTreatment?.text) lines.push(`Note: ${note}`);
  lines.push('B10, median and mean come from the Weibull fit.');
  return lines.join('\n');
}
