import type { ReactNode } from 'react';
import { cleaningCautions } from '#shared/cautions.ts';
import { Alert } from '../../../components/ui/alert.tsx';
import { Card } from '../../../components/ui/card.tsx';
import { SafetyNote } from '../../../components/ui/safety-note.tsx';
import { usePerformance, type PerformanceParams } from '../api/get-performance.ts';
import { allAlerts } from '../utils/labels.ts';
import { AlertsList } from './alerts-list.tsx';
import { FreshnessBanner } from '../../../components/ui/freshness-banner.tsx';

/** Dashboard: the membrane performance alerts, with the cleaning cautions beside them when there is any. */
export function PerformanceAlertsCard({ params, footer }: { params: PerformanceParams; footer?: ReactNode }) {
  const report = usePerformance(params);
  const alerts = allAlerts(report);
  return (
    <Card title="Membrane performance alerts" description={`${report.stages.length} stages normalized against their baselines (ASTM D4516).`}>
      <FreshnessBanner answer={report} compact />
      {alerts.length > 0 ? (
        <div className="grid gap-6 lg:grid-cols-[minmax(0,1fr)_22rem]">
          <AlertsList alerts={alerts} />
          <SafetyNote cautions={cleaningCautions} className="self-start" />
        </div>
      ) : (
        <Alert tone="success">No stage is beyond an alert threshold.</Alert>
      )}
      {footer}
    </Card>
  );
}
