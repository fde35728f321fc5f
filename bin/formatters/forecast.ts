// `osmia kpi forecast`: expected replacements and cost month by month, then the safety cautions.
import { vesselWorkCautions } from '#shared/cautions.ts';
import type { ForecastReport } from '#shared/schemas/forecast.ts';
import { formatNumber, formatTable } from '../output.ts';

type Band = { lower: number | null; upper: number | null };

function band({ lower, upper }: Band): string | null {
  return lower === null || upper === null ? null : `${formatNumber(lower)}–${formatNumber(upper)}`;
}

/**
 * A plain-text forecast: per group, one row per month (expected count, its band, expected cost and
 * its band), a total row; then the months summed over groups, notes, and the cautions of vessel work
 * (the report's own, else those of shared/cautions.ts), which every replacement recommendation carries.
 */
export function formatForecast(report: ForecastReport): string {
  const currency = report.currency ?? '';
  const pct = formatNumber(report.confidence * 100, 1);
  const lines: string[] = [`Element replacement forecast${report.site ? ` — site ${report.site}` : ''} from ${report.asOf}, grouped by ${report.groupBy}`];
  for (const g of report.groups) {
    lines.push(`${g.key}: ${g.inService} element(s) in service${g.weibull ? `, Weibull β ${formatNumber(g.weibull.shape)}, η ${formatNumber(g.weibull.scaleDays, 0)} d` : ''}`);
    const rows = g.months.map((m) => [
      m.label,
      m.expectedCount,
      band({ lower: m.countLower, upper: m.countUpper }),
      m.expectedCost,
      band({ lower: m.costLower, upper: m.costUpper }),
    ]);
    rows.push([
      'total',
      g.total.expectedCount,
      band({ lower: g.total.countLower, upper: g.total.countUpper }),
      g.total.expectedCost,
      band({ lower: g.total.costLower, upper: g.total.costUpper }),
    ]);
    lines.push(formatTable(['month', 'expected replacements', `${pct}% band`, `cost (${currency})`, `cost ${pct}% band (${currency})`], rows));
  }
  if (report.groups.length > 1) {
    lines.push('All groups:');
    lines.push(formatTable(['month', 'expected replacements', `cost (${currency})`], report.totals.map((t) => [t.label, t.expectedCount, t.expectedCost])));
  }
  for (const note of report.notes ?? []) lines.push(`Note: ${note}`);
  lines.push('Before replacing elements (pressure vessels are opened):');
  // An answer always carries them; should its list ever be empty, the shared list is printed all the same.
  for (const caution of report.cautions.length > 0 ? report.cautions : vesselWorkCautions) lines.push(`  ! ${caution}`);
  return lines.join('\n');
}
