// `osmia kpi maintenance-mix`: a small table of the mix, compliance, backlog and cost per m³.
import type { MaintenanceMixReport } from '#shared/schemas/maintenance-mix.ts';
import { formatNumber, formatTable } from '../output.ts';

const percent = (share: number | null) => (share === null ? null : `${formatNumber(share * 100, 1)} %`);

/** A plain-text report: one row per figure with its value and, when it is missing, why. */
export function formatMaintenanceMix(report: MaintenanceMixReport): string {
  const currency = report.currency ?? '';
  const { labour, pmCompliance: pm, backlog, cost } = report;
  const rows: (string | number | null)[][] = [
    ['labour hours, planned / reactive / improvement', `${formatNumber(labour.plannedHours)} / ${formatNumber(labour.reactiveHours)} / ${formatNumber(labour.improvementHours)}`, null],
    ['planned share of hours', percent(labour.plannedShare), labour.reason],
    ['reactive share of hours', percent(labour.reactiveShare), labour.reason],
    ['PM compliance', pm.compliance === null ? null : `${percent(pm.compliance)} (${pm.completedInWindow} of ${pm.due})`, pm.reason],
    ['backlog (work orders / hours)', `${backlog.workOrders} / ${formatNumber(backlog.hours)}`, null],
    ['backlog (weeks of crew capacity)', backlog.weeks, backlog.reason],
    [`maintenance cost (${currency})`, cost.totalCost, null],
    ['permeate produced (m³)', cost.producedM3, cost.reason],
    [`cost per m³ (${currency}/m³)`, cost.costPerM3 === null ? null : formatNumber(cost.costPerM3, 4), cost.reason],
  ];
  const lines = [
    `Maintenance mix${report.site ? ` — site ${report.site}` : ''}${report.asset ? `, asset ${report.asset}` : ''}, ${report.from} to ${report.to}`,
    formatTable(
      ['figure', 'value', 'why missing'],
      rows.map(([label, value, reason]) => [label, value, reason ?? '']),
    ),
  ];
  for (const note of report.notes) lines.push(`Note: ${note}`);
  return lines.join('\n');
}
