import type { Freshness } from '#shared/schemas/common.ts';
import { formatDateTime } from '../../lib/format.ts';
import { Alert } from './alert.tsx';

/**
 * How fresh a KPI answer is: its warnings (derived data not yet rebuilt, with the command that fixes it) as
 * a banner above the figures, and the newest data the figures could use. Every KPI panel and card shows it,
 * so a figure that lags the imports never reads as good news.
 */
export function FreshnessBanner({ answer, compact = false }: { answer: Freshness; compact?: boolean }) {
  const { newestSampleAt, newestWorkOrderAt } = answer.dataAsOf;
  return (
    <div className="space-y-2">
      {answer.warnings.map((w) => (
        <Alert key={w} tone="warning" title="These figures may be incomplete">
          {w}
        </Alert>
      ))}
      {!compact && (newestSampleAt || newestWorkOrderAt) && (
        <p className="text-xs text-basin-600" data-testid="data-as-of">
          Data as of: newest historian sample {newestSampleAt ? formatDateTime(newestSampleAt) : 'none'}, newest work order{' '}
          {newestWorkOrderAt ? formatDateTime(newestWorkOrderAt) : 'none'}.
        </p>
      )}
    </div>
  );
}
