import type { DowntimeReport } from '#shared/schemas/downtime.ts';
import { Badge } from '../../../components/ui/badge.tsx';
import { Table, type Column } from '../../../components/ui/table.tsx';
import { formatDateTime, formatHours, formatMoney, formatNumber, formatVolume } from '../../../lib/format.ts';
import { causeLabel } from '../utils/labels.ts';

type Event = DowntimeReport['events'][number];
type Total = DowntimeReport['totals'][number];

/** Stops, hours, lost volume and cost of each asset with a run-status tag. */
export function DowntimeTotalsTable({ totals, currency }: { totals: readonly Total[]; currency: string }) {
  const columns: Column<Total>[] = [
    { id: 'asset', header: 'Asset', sortValue: (t) => t.asset, cell: (t) => <span className="font-mono text-xs font-bold">{t.asset}</span> },
    { id: 'events', header: 'Stops', align: 'right', sortValue: (t) => t.events, cell: (t) => formatNumber(t.events, 0) },
    { id: 'hours', header: 'Down time', align: 'right', sortValue: (t) => t.hours, cell: (t) => <strong>{formatHours(t.hours, 1)}</strong> },
    { id: 'unplanned', header: 'Unplanned', align: 'right', sortValue: (t) => t.unplannedHours, cell: (t) => formatHours(t.unplannedHours, 1) },
    { id: 'planned', header: 'Planned', align: 'right', sortValue: (t) => t.plannedHours, cell: (t) => formatHours(t.plannedHours, 1) },
    { id: 'rated', header: 'Rated permeate', wrapHeader: true, align: 'right', sortValue: (t) => t.ratedPermeateM3h, cell: (t) => (t.ratedPermeateM3h === null ? '—' : `${formatNumber(t.ratedPermeateM3h, 1)} m³/h`) },
    { id: 'lost', header: 'Lost permeate', align: 'right', sortValue: (t) => t.lostVolumeM3, cell: (t) => formatVolume(t.lostVolumeM3) },
    { id: 'cost', header: 'Cost of lost water', wrapHeader: true, align: 'right', sortValue: (t) => t.cost, cell: (t) => formatMoney(t.cost, currency) },
    { id: 'tag', header: 'Run-status tag', wrapHeader: true, sortValue: (t) => t.tag, cell: (t) => <span className="font-mono text-xs text-basin-700">{t.tag}</span> },
  ];
  return (
    <Table
      caption="Down time by asset"
      columns={columns}
      dense
      rows={totals}
      rowKey={(t) => t.asset}
      initialSort={{ id: 'hours', direction: 'descending' }}
      empty={<p className="text-center text-basin-600">No asset with a run-status tag stopped in this window.</p>}
    />
  );
}

/** Every stop: when, how long, planned or not, its cause and what it cost. */
export function DowntimeEventsTable({ events, currency }: { events: readonly Event[]; currency: string }) {
  const columns: Column<Event>[] = [
    { id: 'asset', header: 'Asset', sortValue: (e) => e.asset, cell: (e) => <span className="font-mono text-xs font-bold whitespace-nowrap">{e.asset}</span> },
    {
      id: 'from',
      header: 'Stopped – running again',
      sortValue: (e) => e.from,
      cell: (e) => (
        <span className="block whitespace-nowrap">
          {e.clippedAtStart && <span title="The stop began before the window or the data">… </span>}
          {formatDateTime(e.from)}
          <span className="block text-xs text-basin-600">
            to {formatDateTime(e.to)}
            {e.clippedAtEnd && <span title="Still stopped where the window or the data ends"> …</span>}
          </span>
        </span>
      ),
    },
    { id: 'hours', header: 'Down time', align: 'right', sortValue: (e) => e.hours, cell: (e) => <strong>{formatHours(e.hours, 1)}</strong> },
    {
      id: 'planned',
      header: 'Kind',
      sortValue: (e) => (e.planned ? 1 : 0),
      cell: (e) =>
        e.planned ? (
          <span title={e.plannedBy.length ? `Planned by ${e.plannedBy.join(', ')}` : undefined}>
            <Badge tone="brand">planned</Badge>
          </span>
        ) : (
          <Badge tone="fault">unplanned</Badge>
        ),
    },
    {
      id: 'cause',
      header: 'Cause',
      sortValue: (e) => e.cause,
      cell: (e) => (
        <span className="whitespace-nowrap">
          <span className={e.cause === 'unknown' ? 'text-basin-600' : 'font-bold'}>{causeLabel(e.cause)}</span>
          {e.causeWorkOrder && <span className="ml-1 font-mono text-xs text-basin-600">{e.causeWorkOrder}</span>}
        </span>
      ),
    },
    {
      id: 'with',
      header: 'Stopped with it',
      sortValue: (e) => e.alsoStopped.join(' '),
      cell: (e) => (e.alsoStopped.length > 0 ? <span className="font-mono text-xs">{e.alsoStopped.join(', ')}</span> : <span className="text-basin-500">—</span>),
    },
    { id: 'lost', header: 'Lost permeate', align: 'right', sortValue: (e) => e.lostVolumeM3, cell: (e) => formatVolume(e.lostVolumeM3) },
    { id: 'cost', header: 'Cost', align: 'right', sortValue: (e) => e.cost, cell: (e) => formatMoney(e.cost, currency) },
  ];
  return (
    <Table
      caption={`${events.length} ${events.length === 1 ? 'stop' : 'stops'}`}
      columns={columns}
      dense
      rows={events}
      rowKey={(e) => `${e.asset}|${e.from}`}
      initialSort={{ id: 'from', direction: 'descending' }}
      pageSize={25}
      empty={<p className="text-center text-basin-600">No stops in this window.</p>}
    />
  );
}
