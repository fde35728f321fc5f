import type { NightlyRun } from '#shared/schemas/nightly.ts';
import { Alert } from '../../../components/ui/alert.tsx';
import { Badge } from '../../../components/ui/badge.tsx';
import { Table, type Column } from '../../../components/ui/table.tsx';
import { formatDateTime, formatDuration, formatHours, formatMoney, formatNumber, formatShare } from '../../../lib/format.ts';
import { fileOutcomeLabels, fileOutcomeTones } from '../utils/labels.ts';

type NightlyFileRow = NightlyRun['files'][number];

const windowLabels = { yesterday: 'Yesterday', 'last-7-days': 'Last 7 days' } as const;

/** What one run did: each file with where it went, each step, and the figures its digest reported. */
export function NightlyRunDetails({ run }: { run: NightlyRun }) {
  const fileColumns: Column<NightlyFileRow>[] = [
    { id: 'file', header: 'File', cell: (f) => <span className="font-mono text-xs whitespace-nowrap text-basin-900">{f.file}</span> },
    { id: 'kind', header: 'Kind', cell: (f) => <span className="whitespace-nowrap">{f.kind ?? <span className="text-basin-600">not recognised</span>}</span> },
    {
      id: 'outcome',
      header: 'Outcome',
      cell: (f) => (
        <span className="whitespace-nowrap">
          <Badge tone={fileOutcomeTones[f.outcome]}>{fileOutcomeLabels[f.outcome]}</Badge>
        </span>
      ),
    },
    { id: 'import', header: 'Import', align: 'right', cell: (f) => (f.importId === null ? '—' : `#${f.importId}`) },
    { id: 'rows', header: 'Rows', align: 'right', cell: (f) => formatNumber(f.rowsRead, 0) },
    { id: 'rejected', header: 'Rejected', align: 'right', cell: (f) => <span className={f.rowsRejected > 0 ? 'font-bold text-ember-700' : undefined}>{formatNumber(f.rowsRejected, 0)}</span> },
    {
      id: 'moved',
      header: 'Moved to / why',
      cell: (f) => (
        <span className="block max-w-md text-xs">
          <span className="font-mono break-all text-basin-800">{f.movedTo ?? 'still in the inbox'}</span>
          {f.reason && <span className="mt-0.5 block text-basin-600">{f.reason}</span>}
        </span>
      ),
    },
  ];
  return (
    <div className="space-y-5">
      {run.error && (
        <Alert tone={run.outcome === 'skipped' ? 'info' : 'warning'} title={run.outcome === 'skipped' ? 'Skipped' : 'What did not go'}>
          {run.error}
        </Alert>
      )}
      <dl className="grid grid-cols-1 gap-x-6 gap-y-1 text-sm sm:grid-cols-[auto_1fr]">
        <dt className="font-bold text-basin-700">Inbox</dt>
        <dd className="font-mono text-xs break-all text-basin-900">{run.inbox}</dd>
        <dt className="font-bold text-basin-700">Started</dt>
        <dd>
          {formatDateTime(run.startedAt)} on {run.host} (process {run.pid}), {run.trigger === 'schedule' ? 'by osmia schedule' : 'by osmia nightly'}
        </dd>
        <dt className="font-bold text-basin-700">Digest up to</dt>
        <dd>{run.reportDate} (its windows end at that day’s midnight, in each site’s zone)</dd>
        {run.mail && (
          <>
            <dt className="font-bold text-basin-700">Mail</dt>
            <dd>
              {run.mail.queued} queued, {run.mail.sent} sent, {run.mail.waiting} waiting in the outbox{run.mail.relay ? ` · via ${run.mail.relay}` : ' · no SMTP server configured'}
              {run.mail.error && <span className="block text-xs text-ember-700">{run.mail.error}</span>}
            </dd>
          </>
        )}
      </dl>
      {run.outcome !== 'skipped' && (
        <Table
          caption={`Files: ${run.files.length}`}
          columns={fileColumns}
          rows={run.files}
          rowKey={(f) => f.file}
          dense
          empty={<p className="text-center text-basin-600">The inbox was empty.</p>}
        />
      )}
      {run.steps.length > 0 && (
        <div>
          <h3 className="text-sm font-bold text-basin-900">Steps</h3>
          <ol className="mt-2 space-y-1 text-sm">
            {run.steps.map((s) => (
              <li key={s.name} className="flex flex-wrap items-baseline gap-2">
                <Badge tone={s.status === 'ok' ? 'ok' : 'fault'}>{s.name}</Badge>
                <span className="tabular-nums text-basin-600">{s.durationMs < 60_000 ? `${formatNumber(s.durationMs / 1000, 1)} s` : formatDuration(s.durationMs / 1000)}</span>
                <span className={s.error ? 'text-ember-700' : 'text-basin-800'}>{s.error ?? s.detail}</span>
              </li>
            ))}
          </ol>
        </div>
      )}
      {run.figures.map((site) => (
        <div key={site.site}>
          <h3 className="text-sm font-bold text-basin-900">Digest figures · {site.site}</h3>
          <div className="mt-2 overflow-x-auto">
            <table className="min-w-full text-sm">
              <thead>
                <tr className="border-b border-basin-200 text-left text-xs text-basin-600">
                  <th className="py-1 pr-4 font-bold">Window</th>
                  <th className="py-1 pr-4 text-right font-bold">Availability</th>
                  <th className="py-1 pr-4 text-right font-bold">Operational availability</th>
                  <th className="py-1 pr-4 text-right font-bold">MTBF</th>
                  <th className="py-1 pr-4 text-right font-bold">MTTR</th>
                  <th className="py-1 pr-4 text-right font-bold">Failures</th>
                  <th className="py-1 pr-4 text-right font-bold">Downtime</th>
                  <th className="py-1 text-right font-bold">Downtime cost</th>
                </tr>
              </thead>
              <tbody>
                {site.windows.map((w) => (
                  <tr key={w.label} className="border-b border-basin-100 tabular-nums">
                    <td className="py-1 pr-4">{windowLabels[w.label]}</td>
                    <td className="py-1 pr-4 text-right">{formatShare(w.reliability?.availability)}</td>
                    <td className="py-1 pr-4 text-right">{formatShare(w.reliability?.operationalAvailability)}</td>
                    <td className="py-1 pr-4 text-right">{formatHours(w.reliability?.mtbfHours)}</td>
                    <td className="py-1 pr-4 text-right">{formatHours(w.reliability?.mttrHours)}</td>
                    <td className="py-1 pr-4 text-right">{w.reliability ? formatNumber(w.reliability.failures, 0) : '—'}</td>
                    <td className="py-1 pr-4 text-right">{formatHours(w.downtime?.hours)}</td>
                    <td className="py-1 text-right">{w.downtime ? formatMoney(w.downtime.cost, w.downtime.currency ?? '') : '—'}</td>
                  </tr>
                ))}
              </tbody>
            </table>
          </div>
          {site.alerts.length > 0 && (
            <ul className="mt-2 list-disc space-y-0.5 pl-5 text-sm text-basin-800">
              {site.alerts.map((a) => (
                <li key={`${a.stage}-${a.kind}`}>
                  {a.stage}: {a.message}
                </li>
              ))}
            </ul>
          )}
          {site.windows.some((w) => w.notes.length > 0) && (
            <ul className="mt-2 space-y-0.5 text-xs text-basin-600">
              {[...new Set(site.windows.flatMap((w) => w.notes))].map((n) => (
                <li key={n}>{n}</li>
              ))}
            </ul>
          )}
        </div>
      ))}
    </div>
  );
}
