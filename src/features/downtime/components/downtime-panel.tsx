import { lazy } from 'react';
import type { DowntimeReport } from '#shared/schemas/downtime.ts';
import { ChartFrame } from '../../../components/charts/chart-frame.tsx';
import { Card } from '../../../components/ui/card.tsx';
import { NotesDetails } from '../../../components/ui/notes-details.tsx';
import { ProvenanceDetails } from '../../../components/ui/provenance-details.tsx';
import { formatDate, formatHours, formatMoney } from '../../../lib/format.ts';
import { useDowntime, type DowntimeParams } from '../api/get-downtime.ts';
import { causeLabel } from '../utils/labels.ts';
import { DowntimeEventsTable, DowntimeTotalsTable } from './downtime-tables.tsx';
import type { ParetoBar } from './pareto-chart.tsx';
import { FreshnessBanner } from '../../../components/ui/freshness-banner.tsx';

const ParetoChart = lazy(() => import('./pareto-chart.tsx').then((m) => ({ default: m.ParetoChart })));

type ParetoRow = DowntimeReport['paretoByCause'][number];

const toBars = (rows: readonly ParetoRow[], label: (key: string) => string): ParetoBar[] =>
  rows.map((r) => ({ key: label(r.key), unplanned: r.unplannedHours, planned: r.plannedHours, share: r.share, cumulative: r.cumulativeShare, events: r.events }));

function ParetoCard({ title, rows, label, what }: { title: string; rows: readonly ParetoRow[]; label: (key: string) => string; what: string }) {
  return (
    <Card title={title} description={`Down time hours by ${what}, largest first; the line adds up their share.`}>
      {rows.length > 0 ? (
        <ChartFrame label={`${title}: ${rows.length} ${what === 'cause' ? 'causes' : 'assets'}`} height={320}>
          <ParetoChart bars={toBars(rows, label)} axisLabel="Down time, hours" />
        </ChartFrame>
      ) : (
        <p className="text-sm text-basin-600">No stops in this window.</p>
      )}
    </Card>
  );
}

/** Downtime page body: Pareto charts, totals by asset, the stops, and the notes on the data. */
export function DowntimePanel({ params, currency }: { params: DowntimeParams; currency: string }) {
  const report = useDowntime(params);
  return (
    <div className="space-y-6">
      <FreshnessBanner answer={report} />
      <p className="text-sm text-basin-700">
        Stops from the run-status tags, {formatDate(report.from)} – {formatDate(report.to)}. A stop is planned when it overlaps the out-of-service
        window of a preventive or inspection work order; its cause is the failure code of the corrective work order that overlaps it most. Lost
        permeate = duration × rated permeate flow, priced at {report.waterValuePerM3 === null ? 'no water value (not set)' : `${formatMoney(report.waterValuePerM3, currency, 2)} per m³`}.
      </p>
      <div className="grid gap-6 xl:grid-cols-2">
        <ParetoCard title="Pareto by cause" rows={report.paretoByCause} label={causeLabel} what="cause" />
        <ParetoCard title="Pareto by asset" rows={report.paretoByAsset} label={(k) => k} what="asset" />
      </div>
      <div className="space-y-2">
        <DowntimeTotalsTable totals={report.totals} currency={currency} />
        <p className="text-xs text-basin-600">
          Each stop is counted once: when a pump stops with its train, the hours are the train’s (the stop lists the assets that stopped with it);
          a pump’s own stop while its train runs is the pump’s. The rows add up to the plant’s {formatHours(report.plant.hours)} in{' '}
          {report.plant.events} stops.
        </p>
      </div>
      <DowntimeEventsTable events={report.events} currency={currency} />
      <NotesDetails notes={report.notes} />
      <ProvenanceDetails provenance={report.provenance} />
    </div>
  );
}
