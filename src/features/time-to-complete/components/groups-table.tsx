import type { TimeToCompleteReport } from '#shared/schemas/time-to-complete.ts';
import { Table, type Column } from '../../../components/ui/table.tsx';
import { formatHours, formatNumber } from '../../../lib/format.ts';
import { nullReasonText } from '../../../lib/null-reason.ts';
import { describeGroup, groupOrder } from '../utils/groups.ts';

type Group = TimeToCompleteReport['groups'][number];

/** n, mean, median and 90th percentile of job durations for every group, with the quantile method named. */
export function GroupsTable({ groups, quantileMethod }: { groups: readonly Group[]; quantileMethod: string }) {
  const rows = [...groups].sort((a, b) => groupOrder(a.key) - groupOrder(b.key));
  const hours = (g: Group, v: number | null | undefined) =>
    v === null || v === undefined ? <span className="text-basin-600" title={nullReasonText(g.reason)}>—</span> : formatHours(v, 2);
  const columns: Column<Group>[] = [
    { id: 'kind', header: 'Grouped by', wrapHeader: true, sortValue: (g) => groupOrder(g.key), cell: (g) => <span className="whitespace-nowrap text-basin-700">{describeGroup(g.key).kind}</span> },
    { id: 'value', header: 'Group', sortValue: (g) => describeGroup(g.key).value, cell: (g) => <span className="font-bold whitespace-nowrap text-basin-900">{describeGroup(g.key).value || '—'}</span> },
    { id: 'n', header: 'Jobs', align: 'right', sortValue: (g) => g.n, cell: (g) => formatNumber(g.n, 0) },
    { id: 'mean', header: 'Mean', align: 'right', sortValue: (g) => g.meanHours, cell: (g) => hours(g, g.meanHours) },
    { id: 'median', header: 'Median', align: 'right', sortValue: (g) => g.medianHours, cell: (g) => <strong>{hours(g, g.medianHours)}</strong> },
    { id: 'p90', header: '90th percentile', wrapHeader: true, align: 'right', sortValue: (g) => g.p90Hours, cell: (g) => hours(g, g.p90Hours) },
    { id: 'sd', header: 'Std. deviation', wrapHeader: true, align: 'right', sortValue: (g) => g.sdHours, cell: (g) => hours(g, g.sdHours) },
    {
      id: 'range',
      header: 'Shortest – longest',
      wrapHeader: true,
      align: 'right',
      cell: (g) => (g.minHours == null || g.maxHours == null ? '—' : <span className="whitespace-nowrap">{`${formatNumber(g.minHours, 2)} – ${formatHours(g.maxHours, 2)}`}</span>),
    },
  ];
  return (
    <Table
      caption={`Job duration, first step’s start to last step’s end. Median and 90th percentile: quantile ${quantileMethod}.`}
      columns={columns}
      dense
      rows={rows}
      rowKey={(g) => g.key}
      empty={<p className="text-center text-basin-600">No jobs with step records in this window.</p>}
    />
  );
}
