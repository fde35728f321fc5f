import type { ImportRecord } from '#shared/schemas/imports.ts';
import { Badge } from '../../../components/ui/badge.tsx';
import { Table } from '../../../components/ui/table.tsx';
import { env } from '../../../config/env.ts';
import { formatDateTime, formatNumber } from '../../../lib/format.ts';
import { describeNote, formatImportDuration, kindLabels, statusLabels, statusMeanings, statusTones } from '../utils/labels.ts';

type Reject = ImportRecord['rejects'][number];

/** Link to every rejected row of an import as CSV (line, reason, the row as read). */
export function RejectsCsvLink({ id }: { id: number }) {
  return (
    <a href={`${env.apiBase}/imports/${id}/rejects.csv`} download className="text-sm font-bold text-tide-700 underline underline-offset-2 hover:text-tide-800">
      Download all rejects (CSV)
    </a>
  );
}

export function RejectsTable({ rejects, total }: { rejects: readonly Reject[]; total: number }) {
  return (
    <Table
      caption={rejects.length < total ? `First ${rejects.length} of ${formatNumber(total, 0)} rejected rows` : `${formatNumber(total, 0)} rejected ${total === 1 ? 'row' : 'rows'}`}
      columns={[
        { id: 'line', header: 'Line', align: 'right', sortValue: (r: Reject) => r.line, cell: (r: Reject) => formatNumber(r.line, 0) },
        { id: 'reason', header: 'Reason', cell: (r: Reject) => r.reason },
      ]}
      rows={rejects}
      rowKey={(r) => `${r.line}-${r.reason}`}
      initialSort={{ id: 'line', direction: 'ascending' }}
      pageSize={20}
    />
  );
}

/** Everything an import record says: status, counts, notes (time-zone corrections…), the error and the first rejects. */
export function ImportRecordView({ record }: { record: ImportRecord }) {
  const counts: [string, number][] = [
    ['Rows read', record.rowsRead],
    ['Inserted', record.rowsInserted],
    ['Updated', record.rowsUpdated],
    ['Unchanged', record.rowsUnchanged],
    ['Rejected', record.rowsRejected],
  ];
  const notes = Object.entries(record.notes).map(([k, v]) => describeNote(k, v));
  return (
    <div className="space-y-4">
      <div className="flex flex-wrap items-center gap-2 text-sm">
        <Badge tone={statusTones[record.status]}>{statusLabels[record.status]}</Badge>
        {record.dryRun && <Badge tone="brand">dry run: nothing kept</Badge>}
        {(record.status === 'completed' || record.status === 'partial') && (
          <Badge tone={record.derivedRefreshed ? 'ok' : 'warning'}>{record.derivedRefreshed ? 'derived data up to date' : 'waits for bin/osmia refresh'}</Badge>
        )}
        <span className="font-bold text-basin-900">{record.file}</span>
        <span className="text-basin-600">
          {kindLabels[record.kind]}
          {record.site && ` · site ${record.site}`} · {formatDateTime(record.startedAt)} · {formatImportDuration(record.durationMs)} · by {record.actor}
        </span>
      </div>
      <p className="text-sm text-basin-800">
        {record.dryRun && record.status !== 'failed'
          ? 'A dry run: nothing was kept; the counts say what importing the file would do.'
          : statusMeanings[record.status]}
      </p>
      {record.error && <p className="rounded-md border border-ember-200 bg-ember-50 px-3 py-2 text-sm text-ember-800">{record.error}</p>}
      <dl className="grid grid-cols-2 gap-x-6 gap-y-3 sm:grid-cols-5">
        {counts.map(([label, n]) => (
          <div key={label}>
            <dt className="text-sm text-basin-600">{label}</dt>
            <dd className={label === 'Rejected' && n > 0 ? 'text-xl font-bold text-ember-700 tabular-nums' : 'text-xl font-bold text-basin-950 tabular-nums'}>{formatNumber(n, 0)}</dd>
          </div>
        ))}
      </dl>
      {notes.length > 0 && (
        <div>
          <h3 className="text-sm font-bold text-basin-800">What the importer noticed</h3>
          <dl className="mt-1 grid gap-x-6 gap-y-1 text-sm sm:grid-cols-2">
            {notes.map(([label, text]) => (
              <div key={label} className="flex gap-2">
                <dt className="text-basin-600">{label}:</dt>
                <dd className="text-basin-900">{text}</dd>
              </div>
            ))}
          </dl>
        </div>
      )}
      {record.rowsRejected > 0 && (
        <div className="space-y-2">
          {record.rejects.length > 0 && <RejectsTable rejects={record.rejects} total={record.rowsRejected} />}
          {record.id !== null && <RejectsCsvLink id={record.id} />}
        </div>
      )}
      <p className="font-mono text-xs break-all text-basin-600">SHA-256 {record.sha256}</p>
    </div>
  );
}
