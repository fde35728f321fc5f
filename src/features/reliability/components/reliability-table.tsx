import type { ReliabilityReport } from '#shared/schemas/reliability.ts';
import { Table, type Column } from '../../../components/ui/table.tsx';
import { formatHours, formatNumber, formatShare } from '../../../lib/format.ts';
import { nullReasonText } from '../../../lib/null-reason.ts';
import { groupLabel, operatingTimeSourceLabels, wideMtbfInterval } from '../utils/labels.ts';

type Group = NonNullable<ReliabilityReport['groups']>[number];

function Missing({ reason }: { reason: string | undefined }) {
  return (
    <span className="text-basin-600" title={reason}>
      —{reason && <span className="sr-only"> ({reason})</span>}
    </span>
  );
}

/** One row per asset (or asset kind): MTBF with its bounds, failures, operating time, MTTR and availability. */
export function ReliabilityTable({ groups, confidence, groupBy }: { groups: readonly Group[]; confidence: number; groupBy: string }) {
  const columns: Column<Group>[] = [
    {
      id: 'asset',
      header: groupBy === 'kind' ? 'Asset kind' : 'Asset',
      sortValue: groupLabel,
      cell: (g) => <span className="font-mono text-xs font-bold whitespace-nowrap text-basin-900">{groupLabel(g)}</span>,
    },
    { id: 'failures', header: 'Failures', align: 'right', sortValue: (g) => g.failures, cell: (g) => formatNumber(g.failures, 0) },
    {
      id: 'operating',
      header: 'Operating time',
      wrapHeader: true,
      align: 'right',
      // A figure and its unit stay on one line.
      className: 'whitespace-nowrap',
      sortValue: (g) => g.operatingHours,
      cell: (g) => formatHours(g.operatingHours, 0),
    },
    {
      id: 'mtbf',
      header: 'MTBF',
      align: 'right',
      className: 'whitespace-nowrap',
      sortValue: (g) => g.mtbfHours,
      cell: (g) => (g.mtbfHours === null ? <Missing reason={nullReasonText(g.reasons?.mtbfHours)} /> : <strong>{formatHours(g.mtbfHours, 0)}</strong>),
    },
    {
      id: 'bounds',
      header: `MTBF ${formatShare(confidence, 0)} bounds`,
      wrapHeader: true,
      align: 'right',
      sortValue: (g) => g.mtbfLowerHours,
      cell: (g) =>
        g.mtbfLowerHours === null ? (
          <Missing reason={nullReasonText(g.reasons?.mtbfLowerHours)} />
        ) : (
          <>
            <span className="whitespace-nowrap text-basin-700">
              {formatNumber(g.mtbfLowerHours, 0)} – {g.mtbfUpperHours === null ? '∞' : formatNumber(g.mtbfUpperHours, 0)} h
            </span>
            {wideMtbfInterval(g) && (
              <span className="block text-xs whitespace-nowrap text-sand-800">
                wide: {g.failures === 1 ? 'one failure' : `${formatNumber(g.failures, 0)} failures`}
              </span>
            )}
          </>
        ),
    },
    {
      id: 'mttr',
      header: 'MTTR',
      align: 'right',
      className: 'whitespace-nowrap',
      sortValue: (g) => g.mttrHours,
      cell: (g) => (g.mttrHours === null ? <Missing reason={nullReasonText(g.reasons?.mttrHours)} /> : formatHours(g.mttrHours, 1)),
    },
    {
      id: 'availability',
      header: 'Inherent availability',
      wrapHeader: true,
      align: 'right',
      sortValue: (g) => g.availability,
      cell: (g) => (g.availability === null ? <Missing reason={nullReasonText(g.reasons?.availability)} /> : formatShare(g.availability, 2)),
    },
    {
      id: 'operational',
      header: 'Operational availability',
      wrapHeader: true,
      align: 'right',
      sortValue: (g) => g.operationalAvailability,
      cell: (g) => formatShare(g.operationalAvailability, 2),
    },
    {
      id: 'source',
      header: 'Operating time from',
      wrapHeader: true,
      sortValue: (g) => g.operatingTimeSource,
      cell: (g) => <span className="text-basin-700">{g.operatingTimeSource ? operatingTimeSourceLabels[g.operatingTimeSource] : '—'}</span>,
    },
  ];
  return (
    <Table
      caption={`${groups.length} ${groupBy === 'kind' ? 'asset kinds' : 'assets'} with their own figures`}
      columns={columns}
      dense
      rows={groups}
      rowKey={(g) => g.key}
      initialSort={{ id: 'mtbf', direction: 'ascending' }}
      empty={<p className="text-center text-basin-600">No asset had a failure in this window, so there are no per-asset figures.</p>}
    />
  );
}
