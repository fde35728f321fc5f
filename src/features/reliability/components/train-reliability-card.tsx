import type { ReactNode } from 'react';
import { Card } from '../../../components/ui/card.tsx';
import { formatHours, formatNumber, formatShare } from '../../../lib/format.ts';
import { nullReasonText } from '../../../lib/null-reason.ts';
import { useReliability } from '../api/get-reliability.ts';
import type { KpiWindow } from '../../../lib/kpi-window.ts';
import { topLevelGroups } from '../utils/labels.ts';
import { FreshnessBanner } from '../../../components/ui/freshness-banner.tsx';

/** Dashboard: availability and MTBF of each train (the top-level assets), with the site's figures under them. */
export function TrainReliabilityCard({ params, footer }: { params: KpiWindow; footer?: ReactNode }) {
  const report = useReliability({ ...params, asset: undefined, groupBy: 'asset' });
  const trains = topLevelGroups(report.groups ?? []).sort((a, b) => (a.asset ?? '').localeCompare(b.asset ?? '', undefined, { numeric: true }));
  return (
    <Card title="Trains" description="Availability and mean time between failures of each train, counting the failures of everything in it.">
      <FreshnessBanner answer={report} compact />
      {trains.length === 0 ? (
        <p className="text-sm text-basin-600">No train had a failure in this window, so there is no MTBF to show.</p>
      ) : (
        <ul className="grid gap-4 sm:grid-cols-2">
          {trains.map((t) => (
            <li key={t.key} className="rounded-md border border-basin-200 p-4">
              <p className="font-mono text-sm font-bold text-tide-800">{t.asset}</p>
              <dl className="mt-2 grid grid-cols-2 gap-x-4 gap-y-2">
                <div>
                  <dt className="text-xs text-basin-600">Availability</dt>
                  <dd className="text-2xl font-bold text-basin-950 tabular-nums">{formatShare(t.operationalAvailability, 1)}</dd>
                  <dd className="text-xs whitespace-nowrap text-basin-600 tabular-nums">inherent {formatShare(t.availability, 1)}</dd>
                </div>
                <div>
                  <dt className="text-xs text-basin-600">MTBF</dt>
                  <dd className="text-2xl font-bold text-basin-950 tabular-nums">{formatHours(t.mtbfHours, 0)}</dd>
                  <dd className="text-xs text-basin-600 tabular-nums">
                    {t.mtbfHours === null ? nullReasonText(t.reasons?.mtbfHours) : `${formatNumber(t.failures, 0)} failures · MTTR ${formatHours(t.mttrHours, 1)}`}
                  </dd>
                </div>
              </dl>
            </li>
          ))}
        </ul>
      )}
      <p className="mt-3 text-xs text-basin-600">
        Availability: up time / (up + down time) from the run status; inherent: MTBF / (MTBF + MTTR). Whole site:{' '}
        {formatNumber(report.failures, 0)} failures in {formatHours(report.operatingHours, 0)} of operation, MTBF {formatHours(report.mtbfHours, 0)}.
      </p>
      {footer}
    </Card>
  );
}
