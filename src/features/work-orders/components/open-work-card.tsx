import type { ReactNode } from 'react';
import { maintenanceCautions } from '#shared/cautions.ts';
import type { OpenWorkOrders } from '#shared/schemas/work-orders.ts';
import { Badge, type BadgeTone } from '../../../components/ui/badge.tsx';
import { Card } from '../../../components/ui/card.tsx';
import { CardTable, type CardTableColumn } from '../../../components/ui/card-table.tsx';
import { SafetyNote } from '../../../components/ui/safety-note.tsx';
import { formatDate, formatDays, formatHours, formatNumber } from '../../../lib/format.ts';
import { useOpenWorkOrders, type OpenWorkOrdersParams } from '../api/get-open-work-orders.ts';

type Priority = OpenWorkOrders['workOrders'][number]['priority'];

const priorityTone: Record<Priority, BadgeTone> = {
  emergency: 'fault',
  high: 'warning',
  medium: 'neutral',
  low: 'neutral',
};

function Figure({ label, value, detail, tone }: { label: string; value: string; detail?: string; tone?: 'fault' }) {
  return (
    <div>
      <dt className="text-sm text-basin-600">{label}</dt>
      <dd
        className={
          tone === 'fault' ? 'mt-0.5 text-2xl font-bold text-ember-700 tabular-nums' : 'mt-0.5 text-2xl font-bold text-basin-950 tabular-nums'
        }
      >
        {value}
      </dd>
      {detail && <dd className="text-xs text-basin-600">{detail}</dd>}
    </div>
  );
}

/** In a narrow card the asset, type and hours columns give way (a container query on the card's width). */
const wide = 'hidden @xl:table-cell';
const openColumns: CardTableColumn[] = [
  { header: 'Work order' },
  { header: 'Asset', className: wide },
  { header: 'Type', className: wide },
  { header: 'Priority' },
  { header: 'Open for', align: 'right' },
  { header: 'Hours', align: 'right', className: wide },
];

/** How long an order has been open: hours under a day, then days. */
const age = (days: number) => (days < 1 ? formatHours(days * 24, 0) : formatDays(days, days < 10 ? 1 : 0));

/** Dashboard: the work orders open at the end of the window, overdue ones first, and the backlog they carry. */
export function OpenWorkCard({ params, footer }: { params: OpenWorkOrdersParams; footer?: ReactNode }) {
  const report = useOpenWorkOrders(params);
  const limits = report.overdueAfterDays;
  const shown = report.workOrders.length;
  return (
    <Card title="Open work" description={`Work orders open on ${formatDate(report.asOf)}, overdue first.`}>
      <div className="space-y-4">
        {/* Columns follow the card's width (a container query), not the screen's: beside the navigation at 800 px it is narrow. */}
        <div className="@container min-w-0">
          <dl className="grid grid-cols-3 gap-4">
            <Figure label="Open" value={formatNumber(report.total, 0)} detail={report.total === 1 ? 'work order' : 'work orders'} />
            <Figure
              label="Overdue"
              value={formatNumber(report.overdue, 0)}
              tone={report.overdue > 0 ? 'fault' : undefined}
              detail="past the age limit"
            />
            <Figure
              label="Backlog"
              value={formatHours(report.hours, 0)}
              detail={report.withoutEstimate > 0 ? `${formatNumber(report.withoutEstimate, 0)} without an estimate` : 'labour estimated'}
            />
          </dl>
          {shown === 0 ? (
            <p className="mt-4 text-sm text-basin-600">No work order is open.</p>
          ) : (
            <div className="mt-4 overflow-x-auto">
              <CardTable caption="Open work orders, overdue first" columns={openColumns}>
                {report.workOrders.map((o) => (
                  <tr key={o.woNumber} className="border-t border-basin-100 align-top">
                    <th scope="row" className="py-1.5 pr-2 text-left font-normal">
                      <span className="font-mono text-xs font-bold whitespace-nowrap text-basin-900">{o.woNumber}</span>
                      {/* In a narrow card the asset goes under the number, so the row fits without scrolling. */}
                      <span className="block max-w-[11rem] truncate text-xs text-basin-600 @xl:max-w-[18rem]" title={o.description}>
                        <span className="font-mono @xl:hidden">{o.asset}</span>
                        {o.description && <span className="@xl:hidden"> · </span>}
                        {o.description}
                      </span>
                    </th>
                    <td className="hidden py-1.5 pr-2 font-mono text-xs whitespace-nowrap @xl:table-cell">{o.asset}</td>
                    <td className="hidden py-1.5 pr-2 text-basin-700 @xl:table-cell">{o.type}</td>
                    <td className="py-1.5 pr-2">
                      <Badge tone={priorityTone[o.priority]}>{o.priority}</Badge>
                    </td>
                    <td className="py-1.5 text-right whitespace-nowrap">
                      {age(o.ageDays)}
                      {o.overdue && (
                        <span className="block">
                          <Badge tone="fault">overdue</Badge>
                        </span>
                      )}
                    </td>
                    <td className="hidden py-1.5 text-right whitespace-nowrap @xl:table-cell">
                      {o.labourHours > 0 ? formatHours(o.labourHours, 1) : '—'}
                    </td>
                  </tr>
                ))}
              </CardTable>
            </div>
          )}
          {shown < report.total && (
            <p className="mt-2 text-xs text-basin-600">
              The {formatNumber(shown, 0)} most pressing of {formatNumber(report.total, 0)} open work orders.
            </p>
          )}
          <p className="mt-3 text-xs text-basin-600">
            Overdue: open longer than {limits.emergency} d for an emergency, {limits.high} d high, {limits.medium} d medium, {limits.low} d low
            priority. Backlog: the labour hours booked or estimated on the open orders.
          </p>
        </div>
        <SafetyNote cautions={maintenanceCautions} />
      </div>
      {footer}
    </Card>
  );
}
