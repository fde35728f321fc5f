import { useState } from 'react';
import { Badge } from '../../../components/ui/badge.tsx';
import { Button } from '../../../components/ui/button.tsx';
import { Card } from '../../../components/ui/card.tsx';
import { ErrorBoundary } from '../../../components/ui/error-boundary.tsx';
import { Table, type Column } from '../../../components/ui/table.tsx';
import { formatBytes, formatDateTime, formatNumber } from '../../../lib/format.ts';
import { useImport, useImports, type ImportHistoryItem } from '../api/get-imports.ts';
import { formatImportDuration, kindShortLabels, statusLabels, statusTones } from '../utils/labels.ts';
import { ImportRecordView } from './import-record-view.tsx';

function Progress({ item }: { item: ImportHistoryItem }) {
  const p = item.progress;
  if (!p) return <span className="text-xs text-basin-600">starting…</span>;
  const share = p.totalBytes > 0 ? Math.min(1, p.bytesRead / p.totalBytes) : 0;
  return (
    <div className="min-w-36">
      <div role="progressbar" aria-label={`Progress of ${item.file}`} aria-valuemin={0} aria-valuemax={100} aria-valuenow={Math.round(share * 100)} className="h-1.5 overflow-hidden rounded-full bg-basin-100">
        <div className="h-full bg-tide-600" style={{ width: `${share * 100}%` }} />
      </div>
      <p className="mt-0.5 text-xs text-basin-600 tabular-nums">
        {formatNumber(p.rowsRead, 0)} rows · {formatBytes(p.bytesRead)} of {formatBytes(p.totalBytes)}
      </p>
    </div>
  );
}

function ImportDetailView({ id }: { id: number }) {
  const record = useImport(id);
  return <ImportRecordView record={record} />;
}

/** Every import, newest first, sortable; polled while one runs. "Details" opens its record with the first rejects. */
export function ImportHistory() {
  const imports = useImports();
  const [openId, setOpenId] = useState<number | null>(null);
  const running = imports.filter((i) => i.status === 'running').length;
  const columns: Column<ImportHistoryItem>[] = [
    {
      id: 'started',
      header: 'Started',
      sortValue: (i) => i.startedAt,
      cell: (i) => (
        <span className="block whitespace-nowrap">
          {formatDateTime(i.startedAt)}
          <span className="block text-xs text-basin-600">by {i.actor}</span>
        </span>
      ),
    },
    {
      id: 'file',
      header: 'File',
      sortValue: (i) => i.file,
      cell: (i) => (
        <span className="block">
          <span className="font-mono text-xs whitespace-nowrap text-basin-900">{i.file}</span>
          <span className="block text-xs text-basin-600">{kindShortLabels[i.kind]}</span>
        </span>
      ),
    },
    { id: 'site', header: 'Site', sortValue: (i) => i.site, cell: (i) => i.site ?? '—' },
    {
      id: 'status',
      header: 'Status',
      sortValue: (i) => i.status,
      cell: (i) => (i.status === 'running' ? <Progress item={i} /> : <Badge tone={statusTones[i.status]}>{statusLabels[i.status]}</Badge>),
    },
    { id: 'read', header: 'Read', align: 'right', sortValue: (i) => i.rowsRead, cell: (i) => formatNumber(i.rowsRead, 0) },
    { id: 'inserted', header: 'Inserted', align: 'right', sortValue: (i) => i.rowsInserted, cell: (i) => formatNumber(i.rowsInserted, 0) },
    {
      id: 'rejected',
      header: 'Rejected',
      align: 'right',
      sortValue: (i) => i.rowsRejected,
      cell: (i) => <span className={i.rowsRejected > 0 ? 'font-bold text-ember-700' : undefined}>{formatNumber(i.rowsRejected, 0)}</span>,
    },
    { id: 'duration', header: 'Duration', align: 'right', sortValue: (i) => i.durationMs, cell: (i) => <span className="whitespace-nowrap">{i.status === 'running' ? '…' : formatImportDuration(i.durationMs)}</span> },
    {
      id: 'details',
      header: 'Details',
      cell: (i) =>
        i.id === null ? null : (
          <Button variant="ghost" size="sm" aria-expanded={openId === i.id} aria-label={`Details of import ${i.id} (${i.file})`} onClick={() => setOpenId(openId === i.id ? null : i.id)}>
            {openId === i.id ? 'Hide' : 'Details'}
          </Button>
        ),
    },
  ];
  return (
    <div className="space-y-4">
      <Table
        caption={`Import history: ${imports.length} ${imports.length === 1 ? 'import' : 'imports'}${running > 0 ? `, ${running} running (refreshed every few seconds)` : ''}`}
        columns={columns}
      dense
        rows={imports}
        rowKey={(i) => i.id ?? `${i.startedAt}-${i.file}`}
        initialSort={{ id: 'started', direction: 'descending' }}
        pageSize={25}
        empty={<p className="text-center text-basin-600">Nothing has been imported yet.</p>}
      />
      {openId !== null && (
        <Card title={`Import ${openId}`} actions={<Button variant="secondary" size="sm" onClick={() => setOpenId(null)}>Close</Button>}>
          <ErrorBoundary title="The import">
            <ImportDetailView id={openId} />
          </ErrorBoundary>
        </Card>
      )}
    </div>
  );
}
