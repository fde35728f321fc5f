import { cleaningCautions } from '#shared/cautions.ts';
import { Alert } from '../../../components/ui/alert.tsx';
import { Card } from '../../../components/ui/card.tsx';
import { EmptyState } from '../../../components/ui/empty-state.tsx';
import { NotesDetails } from '../../../components/ui/notes-details.tsx';
import { ProvenanceDetails } from '../../../components/ui/provenance-details.tsx';
import { SafetyNote } from '../../../components/ui/safety-note.tsx';
import { formatDate } from '../../../lib/format.ts';
import { usePerformance, type PerformanceParams } from '../api/get-performance.ts';
import { allAlerts } from '../utils/labels.ts';
import { AlertsList } from './alerts-list.tsx';
import { StageCard } from './stage-card.tsx';
import { FreshnessBanner } from '../../../components/ui/freshness-banner.tsx';

/** Performance page body: the alerts with the cleaning cautions, then one card per stage. */
export function PerformancePanel({ params }: { params: PerformanceParams }) {
  const report = usePerformance(params);
  const alerts = allAlerts(report);
  if (report.stages.length === 0) {
    return <EmptyState title="No stage to normalize" description="Performance needs stages with pressure, flow, conductivity and temperature tags, and a run-status tag on the train." />;
  }
  return (
    <div className="space-y-6">
      <FreshnessBanner answer={report} />
      <Card
        title="Alerts"
        description={`Normalized performance beyond the alert thresholds of the settings, ${report.from ? `${formatDate(report.from)} – ${formatDate(report.to)}` : 'in the window'}.`}
      >
        {alerts.length > 0 ? (
          <div className="grid gap-6 xl:grid-cols-[minmax(0,1fr)_22rem]">
            <AlertsList alerts={alerts} />
            <SafetyNote cautions={cleaningCautions} className="self-start" />
          </div>
        ) : (
          <Alert tone="success">No stage is beyond an alert threshold on its latest day.</Alert>
        )}
      </Card>
      {report.stages.map((stage) => (
        <StageCard key={stage.asset} stage={stage} />
      ))}
      <NotesDetails notes={report.notes} />
      <ProvenanceDetails provenance={report.provenance} />
    </div>
  );
}
