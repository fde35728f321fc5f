// `osmia kpi time-to-complete`: one row per group of jobs with n, mean, median and p90 in hours.
import { vesselWorkCautions } from '#shared/cautions.ts';
import type { TimeToCompleteReport } from '#shared/schemas/time-to-complete.ts';
import { formatTable } from '../output.ts';

/** A plain-text report: group rows, the learning curve by period, the quantile method and the cautions. */
export function formatTimeToComplete(
  report: TimeToCompleteReport & { cautions?: readonly string[]; procedureDefinition?: string },
): string {
  const lines: string[] = [
    `Time to complete${report.site ? ` — site ${report.site}` : ''}: ${report.jobs.length} job(s)` +
      `${report.from && report.to ? `, first step ${report.from} to ${report.to}` : ''}`,
  ];
  lines.push(
    formatTable(
      ['group', 'n', 'mean (h)', 'median (h)', 'p90 (h)'],
      report.groups.map((g) => [g.key, g.n, g.meanHours, g.medianHours, g.p90Hours]),
    ),
  );
  const periods = report.learningCurve?.byPeriod ?? [];
  if (periods.length > 0) {
    lines.push('Learning curve:');
    lines.push(formatTable(['period', 'n', 'median (h)', 'mean (h)'], periods.map((p) => [p.label, p.n, p.medianHours, p.meanHours])));
  }
  lines.push(`Quantiles: ${report.quantileMethod}.`);
  if (report.procedureDefinition) lines.push(`Procedure: ${report.procedureDefinition}`);
  lines.push('Vessel work:');
  for (const caution of report.cautions ?? vesselWorkCautions) lines.push(`  ! ${caution}`);
  return lines.join('\n');
}
