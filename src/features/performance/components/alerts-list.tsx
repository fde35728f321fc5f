import { Badge } from '../../../components/ui/badge.tsx';
import { formatChangePct, formatDate, formatNumber } from '../../../lib/format.ts';
import { alertKindLabels, unitLabels, type PerformanceAlert } from '../utils/labels.ts';

type StageAlert = PerformanceAlert & { stage: string };

/** Performance alerts: what crossed which threshold, since when, and what to check before deciding. */
export function AlertsList({ alerts, compact = false }: { alerts: readonly StageAlert[]; compact?: boolean }) {
  return (
    <ul className="space-y-3">
      {alerts.map((a) => (
        <li key={`${a.stage}-${a.kind}-${a.time}`} className="rounded-md border border-sand-200 border-l-4 border-l-ember-500 bg-white px-4 py-3">
          <div className="flex flex-wrap items-center gap-2">
            <Badge tone="fault">{a.stage}</Badge>
            <p className="font-bold text-basin-900">{alertKindLabels[a.kind]}</p>
            <span className="text-sm font-bold text-ember-700 tabular-nums">{formatChangePct(a.changePct)}</span>
            <span className="text-xs text-basin-600">threshold {formatChangePct(a.kind === 'permeate-flow-drop' ? -a.thresholdPct : a.thresholdPct, 0)}</span>
          </div>
          <p className="mt-1 text-sm text-basin-800">
            {a.message} Now {formatNumber(a.value, 2)} {unitLabels[a.unit]} against {formatNumber(a.baselineValue, 2)} {unitLabels[a.unit]} at the baseline; beyond the
            threshold since {formatDate(a.since)} (latest {formatDate(a.time)}).
          </p>
          {!compact && <p className="mt-1 text-sm text-basin-700">{a.recommendation}</p>}
        </li>
      ))}
    </ul>
  );
}
