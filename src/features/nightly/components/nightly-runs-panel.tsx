import { useState, useTransition } from 'react';
import type { NightlyRun } from '#shared/schemas/nightly.ts';
import { Badge } from '../../../components/ui/badge.tsx';
import { Button } from '../../../components/ui/button.tsx';
import { Card } from '../../../components/ui/card.tsx';
import { Pager } from '../../../components/ui/pager.tsx';
import { Table, type Column } from '../../../components/ui/table.tsx';
import { formatDateTime, formatDuration } from '../../../lib/format.ts';
import { nightlyRunsPageSize, useNightlyRuns } from '../api/get-nightly-runs.ts';
import { filesSummary, mailSummary, outcomeLabels, outcomeTones } from '../utils/labels.ts';
import { NightlyRunDetails } from './nightly-run-details.tsx';

const duration = (run: NightlyRun) => (run.finishedAt ? formatDuration((Date.parse(run.finishedAt) - Date.parse(run.startedAt)) / 1000) : '…');

/** Every nightly run, newest first, a page at a time; "Details" opens what one run did. Polled while a run is under way. */
export function NightlyRunsPanel() {
  const [offset, setOffset] = useState(0);
  const [pending, startTransition] = useTransition();
  const page = useNightlyRuns(offset);
  const [openId, setOpenId] = useState<number | null>(null);
  const open = page.runs.find((r) => r.id === openId) ?? null;
  const columns: Column<NightlyRun>[] = [
    {
      id: 'started',
      header: 'Started',
      cell: (r) => (
        <span className="block whitespace-nowrap">
          {formatDateTime(r.startedAt)}
          <span className="block text-xs text-basin-600">
            run {r.id} · {r.trigger === 'schedule' ? 'schedule' : 'command'} on {r.host}
          </span>
        </span>
      ),
    },
    { id: 'outcome', header: 'Outcome', cell: (r) => <Badge tone={outcomeTones[r.outcome ?? 'running']}>{outcomeLabels[r.outcome ?? 'running']}</Badge> },
    { id: 'report', header: 'Digest up to', cell: (r) => <span className="whitespace-nowrap tabular-nums">{r.reportDate}</span> },
    { id: 'files', header: 'Files', cell: (r) => filesSummary(r) },
    {
      id: 'steps',
      header: 'Steps',
      cell: (r) => (
        <span className="flex flex-wrap gap-1">
          {r.steps.length === 0 ? '—' : r.steps.map((s) => <Badge key={s.name} tone={s.status === 'ok' ? 'ok' : 'fault'}>{s.name}</Badge>)}
        </span>
      ),
    },
    { id: 'mail', header: 'Mail', cell: (r) => <span className={r.mail && r.mail.waiting > 0 ? 'font-bold text-ember-700' : undefined}>{mailSummary(r)}</span> },
    { id: 'duration', header: 'Duration', align: 'right', cell: (r) => <span className="whitespace-nowrap tabular-nums">{duration(r)}</span> },
    {
      id: 'details',
      header: 'Details',
      cell: (r) => (
        <Button variant="ghost" size="sm" aria-expanded={openId === r.id} aria-label={`Details of nightly run ${r.id}`} onClick={() => setOpenId(openId === r.id ? null : r.id)}>
          {openId === r.id ? 'Hide' : 'Details'}
        </Button>
      ),
    },
  ];
  return (
    <div className="space-y-4">
      <Table
        caption={`Nightly runs${page.total ? `: ${page.total}` : ''}`}
        columns={columns}
        rows={page.runs}
        rowKey={(r) => r.id}
        dense
        empty={
          <p className="text-center text-basin-600">
            No nightly run yet. Put export files in the inbox and run <code className="font-mono">bin/osmia nightly</code> (or let cron or{' '}
            <code className="font-mono">bin/osmia schedule</code> do it).
          </p>
        }
      />
      <Pager noun="runs" offset={offset} limit={nightlyRunsPageSize} total={page.total} pending={pending} onOffset={(o) => startTransition(() => setOffset(o))} />
      {open && (
        <Card
          title={`Nightly run ${open.id}`}
          description={`${formatDateTime(open.startedAt)} · ${outcomeLabels[open.outcome ?? 'running']}`}
          actions={
            <Button variant="secondary" size="sm" onClick={() => setOpenId(null)}>
              Close
            </Button>
          }
        >
          <NightlyRunDetails run={open} />
        </Card>
      )}
    </div>
  );
}
