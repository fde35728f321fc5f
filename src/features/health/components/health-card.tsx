import { Badge } from '../../../components/ui/badge.tsx';
import { Card } from '../../../components/ui/card.tsx';
import { formatDuration, formatNumber } from '../../../lib/format.ts';
import { useHealth } from '../api/get-health.ts';

/** Server and database status from GET /api/health, refreshed every 30 s. */
export function HealthCard() {
  const health = useHealth();
  const ok = health.status === 'ok';
  return (
    <Card
      title="Server health"
      description="Checked every 30 seconds."
      actions={<Badge tone={ok ? 'ok' : 'fault'}>{ok ? 'All systems running' : 'Degraded'}</Badge>}
    >
      <dl className="grid grid-cols-2 gap-x-6 gap-y-4 text-sm sm:grid-cols-4">
        <div>
          <dt className="text-basin-600">Server</dt>
          <dd className="mt-0.5 font-bold text-basin-900">{ok ? 'Running' : 'Running, degraded'}</dd>
        </div>
        <div>
          <dt className="text-basin-600">Database</dt>
          <dd className={health.database.up ? 'mt-0.5 font-bold text-kelp-700' : 'mt-0.5 font-bold text-ember-700'}>
            {health.database.up ? `Up, ${formatNumber(health.database.latencyMs, 1)} ms` : 'Unreachable'}
          </dd>
        </div>
        <div>
          <dt className="text-basin-600">Up for</dt>
          <dd className="mt-0.5 font-bold text-basin-900">{formatDuration(health.uptimeSeconds)}</dd>
        </div>
        <div>
          <dt className="text-basin-600">Version</dt>
          <dd className="mt-0.5 font-bold text-basin-900">{health.version}</dd>
        </div>
      </dl>
      {health.database.error && <p className="mt-4 text-sm text-ember-700">{health.database.error}</p>}
    </Card>
  );
}
