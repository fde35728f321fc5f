// `osmia kpi reliability`: the key figures of the asset (or site), then one row per group, then notes.
import { nullReasonMessages, type NullReason } from '#shared/kpi/stats.ts';
import type { ReliabilityReport } from '#shared/schemas/reliability.ts';
import { formatNumber, formatTable } from '../output.ts';

const percent = (share: number | null | undefined) => (share === null || share === undefined ? null : `${formatNumber(share * 100, 1)} %`);

const sourceWords: Record<string, string> = {
  'run-status': "the asset's run-status tag",
  'ancestor-run-status': "the run-status tag of the nearest asset above it",
  'calendar-less-out-of-service': 'calendar time less out-of-service windows (no run-status tag)',
};

function why(reasons: Record<string, NullReason> | undefined, key: string): string {
  const reason = reasons?.[key];
  return reason ? nullReasonMessages[reason] : '';
}

/**
 * A plain-text reliability report: a figure table (value and, when missing, why), the MTBF bounds' method,
 * a table of groups when the report has them, then notes. Hours in h, availabilities in %.
 */
export function formatReliability(report: ReliabilityReport & { notes?: readonly string[] }): string {
  const pct = formatNumber(report.confidence * 100, 1);
  const what = report.asset ? `asset ${report.asset}` : 'whole site';
  const scope = report.scope && report.scope.length > 1 ? ` and the ${report.scope.length - 1} asset(s) below it` : '';
  const lines: string[] = [
    `Reliability${report.site ? ` — site ${report.site}` : ''}, ${what}${scope}` +
      `${report.from && report.to ? `, ${report.from} to ${report.to}` : ', no data to bound a window'}`,
  ];
  if (report.operatingTimeSource) lines.push(`Operating time from ${sourceWords[report.operatingTimeSource]}.`);
  const r = report.reasons;
  const rows: [string, string | number | null, string][] = [
    ['operating time (h)', report.operatingHours, ''],
    ['failures', report.failures, ''],
    ['MTBF (h)', report.mtbfHours, why(r, 'mtbfHours')],
    [`MTBF lower bound, ${pct} % (h)`, report.mtbfLowerHours, why(r, 'mtbfLowerHours')],
    [`MTBF upper bound, ${pct} % (h)`, report.mtbfUpperHours, why(r, 'mtbfUpperHours')],
    ['MTTR, mean time to restoration (h)', report.mttrHours, why(r, 'mttrHours')],
    ['mean active repair time (h)', report.meanActiveRepairHours ?? null, why(r, 'meanActiveRepairHours')],
    ['availability, inherent', percent(report.availability), why(r, 'availability')],
    ['operational availability', percent(report.operationalAvailability), why(r, 'operationalAvailability')],
  ];
  lines.push(formatTable(['figure', 'value', 'why missing'], rows));
  lines.push(
    `MTBF bounds: ${report.sides ?? 'two-sided'}, ${report.terminated ?? 'time'}-terminated chi-square bounds ` +
      '(NIST/SEMATECH e-Handbook of Statistical Methods §8.4.5.1).',
  );
  const groups = report.groups ?? [];
  if (groups.length > 0) {
    lines.push(
      formatTable(
        ['group', 'operating time from', 'T (h)', 'failures', 'MTBF (h)', `lower ${pct} % (h)`, `upper ${pct} % (h)`, 'MTTR (h)', 'availability'],
        groups.map((g) => [
          g.key,
          g.operatingTimeSource ?? null,
          g.operatingHours,
          g.failures,
          g.mtbfHours,
          g.mtbfLowerHours,
          g.mtbfUpperHours,
          g.mttrHours,
          percent(g.availability),
        ]),
      ),
    );
  }
  for (const note of report.notes ?? []) lines.push(`Note: ${note}`);
  return lines.join('\n');
}
