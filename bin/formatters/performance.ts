// `osmia kpi performance`: per stage the baseline, the latest normalized figures against it, the last days
// of the trend, and the alerts with their recommendations and safety cautions.
import type { PerformanceReport } from '#shared/schemas/performance.ts';
import { formatNumber, formatTable } from '../output.ts';

/** Days of the trend printed per stage; `--json` gives every point. */
export const TREND_DAYS = 7;

type Stage = PerformanceReport['stages'][number] & { reason?: string | null };

const change = (pct: number | null) => (pct === null ? null : `${pct > 0 ? '+' : ''}${formatNumber(pct, 1)} %`);
const day = (iso: string) => iso.slice(0, 10);

function formatStage(stage: Stage): string[] {
  const lines = [`Stage ${stage.asset}${stage.train ? ` (train ${stage.train})` : ''}`];
  if (stage.reason) {
    lines.push(`  No figures: ${stage.reason}`);
    return lines;
  }
  const { baseline, latest } = stage;
  if (!baseline || !latest) {
    for (const note of stage.notes) lines.push(`  ${note}`);
    return lines;
  }
  lines.push(
    `  Baseline ${day(baseline.time)}: ${baseline.reason === 'after-reset' ? `first day after the element change or cleaning of ${baseline.resetAt}` : 'first day of running data'}.`,
  );
  const n = latest.normalized;
  lines.push(
    formatTable(
      ['normalized figure', 'baseline', `latest (${day(latest.state.time)})`, 'change'],
      [
        ['permeate flow (m³/h)', n.baselinePermeateFlowM3h, n.permeateFlowM3h, change(n.permeateFlowChangePct)],
        ['salt passage (%)', formatNumber(n.baselineSaltPassagePct, 3), formatNumber(n.saltPassagePct, 3), change(n.saltPassageChangePct)],
        ['differential pressure (bar)', formatNumber(n.baselineDifferentialPressureBar, 3), formatNumber(n.differentialPressureBar, 3), change(n.differentialPressureChangePct)],
      ],
    ),
  );
  const s = latest.state;
  lines.push(
    `  Latest day: feed ${formatNumber(s.tempC, 1)} °C (TCF ${formatNumber(s.tcf, 3)}), net driving pressure ${formatNumber(s.netDrivingPressureBar)} bar, ` +
      `recovery ${formatNumber(s.recovery * 100, 1)} %.`,
  );
  const trend = stage.points.slice(-TREND_DAYS);
  lines.push(
    formatTable(
      ['day', 'permeate flow (m³/h)', 'Δ flow', 'Δ salt passage', 'Δ diff. pressure'],
      trend.map((p) => [
        day(p.state.time),
        p.normalized.permeateFlowM3h,
        change(p.normalized.permeateFlowChangePct),
        change(p.normalized.saltPassageChangePct),
        change(p.normalized.differentialPressureChangePct),
      ]),
    ),
  );
  for (const alert of stage.alerts) {
    lines.push(`  ALERT ${alert.kind} since ${day(alert.since)} (threshold ${formatNumber(alert.thresholdPct)} %): ${alert.message}`);
    lines.push(`    ${alert.recommendation}`);
  }
  const cautions = [...new Set(stage.alerts.flatMap((a) => a.cautions))];
  if (cautions.length > 0) {
    lines.push('  Before acting on these alerts:');
    for (const caution of cautions) lines.push(`    ! ${caution}`);
  }
  for (const note of stage.notes) lines.push(`  Note: ${note}`);
  return lines;
}

/**
 * A plain-text performance report (ASTM D4516 normalization): per stage the baseline, the latest normalized
 * permeate flow, salt passage and differential pressure against it (% change), the last TREND_DAYS days, and
 * the alerts with their recommendations and the cautions they carry (shared/cautions.ts).
 */
export function formatPerformance(report: Omit<PerformanceReport, 'stages'> & { stages: Stage[]; notes?: readonly string[] }): string {
  const lines: string[] = [
    `Normalized performance (ASTM D4516)${report.site ? ` — site ${report.site}` : ''}` +
      `${report.from && report.to ? `, ${report.from} to ${report.to}` : ', no data to bound a window'}`,
  ];
  if (report.stages.length === 0) lines.push('No stage to report.');
  for (const stage of report.stages) lines.push(...formatStage(stage));
  for (const note of report.notes ?? []) lines.push(`Note: ${note}`);
  return lines.join('\n');
}
