import type { TimeToCompleteReport } from '#shared/schemas/time-to-complete.ts';
import { Badge } from '../../../components/ui/badge.tsx';
import { Table, type Column } from '../../../components/ui/table.tsx';
import { formatDateTime, formatHours, formatNumber } from '../../../lib/format.ts';

type Job = TimeToCompleteReport['jobs'][number];

/** Every job with its duration, 25 at first. */
export function JobsTable({ jobs }: { jobs: readonly Job[] }) {
  const columns: Column<Job>[] = [
    { id: 'wo', header: 'Work order', sortValue: (j) => j.woNumber, cell: (j) => <span className="font-mono text-xs font-bold">{j.woNumber}</span> },
    { id: 'procedure', header: 'Job', sortValue: (j) => j.procedure ?? null, cell: (j) => <span className="whitespace-nowrap">{j.procedure ?? '—'}</span> },
    { id: 'crew', header: 'Crew', sortValue: (j) => j.crew ?? null, cell: (j) => j.crew ?? '—' },
    {
      id: 'guided',
      header: 'Procedure',
      sortValue: (j) => (j.guided ? 1 : 0),
      cell: (j) => <span className="whitespace-nowrap">{j.guided ? <Badge tone="ok">followed</Badge> : <Badge tone="neutral">not followed</Badge>}</span>,
    },
    { id: 'steps', header: 'Steps', align: 'right', sortValue: (j) => j.steps ?? null, cell: (j) => formatNumber(j.steps, 0) },
    { id: 'start', header: 'Started', sortValue: (j) => j.startedAt, cell: (j) => <span className="whitespace-nowrap">{formatDateTime(j.startedAt)}</span> },
    { id: 'end', header: 'Completed', sortValue: (j) => j.completedAt, cell: (j) => <span className="whitespace-nowrap">{formatDateTime(j.completedAt)}</span> },
    { id: 'hours', header: 'Duration', align: 'right', sortValue: (j) => j.hours, cell: (j) => <strong>{formatHours(j.hours, 2)}</strong> },
  ];
  return (
    <Table
      caption={`${jobs.length} ${jobs.length === 1 ? 'job' : 'jobs'}, each from its first step’s start to its last step’s end`}
      columns={columns}
      dense
      rows={jobs}
      rowKey={(j) => j.woNumber}
      initialSort={{ id: 'start', direction: 'descending' }}
      pageSize={25}
      empty={<p className="text-center text-basin-600">No jobs in this window.</p>}
    />
  );
}
