import type { ReactNode } from 'react';
import { Card } from '../../../components/ui/card.tsx';
import { CardTable, type CardTableColumn } from '../../../components/ui/card-table.tsx';
import { formatHours, formatMoney, formatNumber, formatShare, formatVolume } from '../../../lib/format.ts';
import { useDowntime, type DowntimeParams } from '../api/get-downtime.ts';
import { causeLabel } from '../utils/labels.ts';
import { FreshnessBanner } from '../../../components/ui/freshness-banner.tsx';

const summaryColumns: CardTableColumn[] = [
  { header: 'Asset' },
  { header: 'Down time', align: 'right' },
  { header: 'Lost permeate', align: 'right' },
  { header: 'Cost', align: 'right' },
];

/** Dashboard: down time, lost permeate and its cost by asset, and the causes that took the most hours. */
export function DowntimeSummaryCard({ params, currency, footer }: { params: DowntimeParams; currency: string; footer?: ReactNode }) {
  const report = useDowntime(params);
  const assets = [...report.totals].filter((t) => t.events > 0).sort((a, b) => b.hours - a.hours).slice(0, 4);
  const causes = report.paretoByCause.slice(0, 5);
  const longest = Math.max(...causes.map((c) => c.hours), 1);
  return (
    <Card title="Downtime" description={`${formatNumber(report.events.length, 0)} stops of the assets with a run-status tag.`}>
      <FreshnessBanner answer={report} compact />
      {assets.length === 0 ? (
        <p className="text-sm text-basin-600">No stops in this window.</p>
      ) : (
        <CardTable caption="Down time by asset" columns={summaryColumns}>
          {assets.map((t) => (
            <tr key={t.asset} className="border-t border-basin-100">
              <th scope="row" className="py-1 text-left font-mono text-xs font-bold">
                {t.asset}
              </th>
              <td className="py-1 text-right font-bold">{formatHours(t.hours, 0)}</td>
              <td className="py-1 text-right">{formatVolume(t.lostVolumeM3)}</td>
              <td className="py-1 text-right">{formatMoney(t.cost, currency)}</td>
            </tr>
          ))}
        </CardTable>
      )}
      {causes.length > 0 && (
        <>
          <h3 className="mt-4 text-sm font-bold text-basin-800">Top causes by hours</h3>
          <ul className="mt-2 space-y-1.5">
            {causes.map((c) => (
              <li key={c.key} className="grid grid-cols-[9rem_1fr_auto] items-center gap-3 text-sm">
                <span className={c.key === 'unknown' ? 'truncate text-basin-600' : 'truncate font-bold text-basin-900'}>{causeLabel(c.key)}</span>
                <span className="h-2 rounded-full bg-basin-100" aria-hidden="true">
                  <span className="block h-full rounded-full bg-ember-500" style={{ width: `${(c.hours / longest) * 100}%` }} />
                </span>
                <span className="text-right text-xs text-basin-700 tabular-nums">
                  {formatHours(c.hours, 0)} · {formatShare(c.share, 0)}
                </span>
              </li>
            ))}
          </ul>
        </>
      )}
      <p className="mt-3 text-xs text-basin-600">
        Each stop counted once (a pump that stops with its train is in the train’s row): {formatHours(report.plant.hours)} in {report.plant.events}{' '}
        {report.plant.events === 1 ? 'stop' : 'stops'} for the plant.
      </p>
      {footer}
    </Card>
  );
}
