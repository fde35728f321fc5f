import type { ReportWorkbook, StoredReport } from '#shared/schemas/reports.ts';
import { Alert } from '../../../components/ui/alert.tsx';
import { Button } from '../../../components/ui/button.tsx';
import { Card } from '../../../components/ui/card.tsx';
import { EmptyState } from '../../../components/ui/empty-state.tsx';
import { Table, type Column } from '../../../components/ui/table.tsx';
import { showToast } from '../../../components/ui/toast.tsx';
import { getErrorMessage } from '../../../lib/api-client.ts';
import { formatBytes, formatDateTime } from '../../../lib/format.ts';
import { toSearch, type KpiWindow } from '../../../lib/kpi-window.ts';
import { useDownloadWorkbook } from '../api/download-workbook.ts';
import { useReports } from '../api/get-reports.ts';
import { readerOf } from '../utils/labels.ts';

function DownloadIcon() {
  return (
    <svg viewBox="0 0 20 20" className="size-4" fill="none" stroke="currentColor" strokeWidth="2" strokeLinecap="round" strokeLinejoin="round" aria-hidden="true">
      <path d="M10 3v9m0 0-3.5-3.5M10 12l3.5-3.5M4 15.5h12" />
    </svg>
  );
}

/** The window of the address in words: its two days, or the whole range of the data when it names none. */
function windowText(window: KpiWindow): string {
  if (!window.from && !window.to) return 'the whole range of the site’s data';
  return `${window.from ?? 'the first day of the data'} to ${window.to ?? 'the day after the data ends'} (not included)`;
}

function WorkbookCard({ workbook, window }: { workbook: ReportWorkbook; window: KpiWindow }) {
  const download = useDownloadWorkbook();
  const search = toSearch({ site: window.site, from: window.from, to: window.to });
  const fallbackName = `${workbook.name}.xlsx`;
  return (
    <li className="flex flex-col rounded-lg border border-basin-200 bg-white p-4 shadow-sm">
      <p className="text-xs font-bold tracking-wide text-tide-700 uppercase">{readerOf[workbook.name]}</p>
      <h3 className="mt-1 text-base font-bold text-basin-900">{workbook.title} workbook</h3>
      <p className="mt-1 flex-1 text-sm text-basin-700">{workbook.description}</p>
      <div className="mt-4">
        <Button
          onClick={() =>
            download.mutate(
              { url: `${workbook.url}${search}`, fallbackName },
              { onSuccess: (name) => showToast({ tone: 'success', title: `${workbook.title} workbook downloaded`, message: `Saved as ${name}.` }) },
            )
          }
          loading={download.isPending}
          aria-label={`Download the ${workbook.title.toLowerCase()} workbook`}
        >
          {!download.isPending && <DownloadIcon />}
          {download.isPending ? 'Building…' : 'Download .xlsx'}
        </Button>
      </div>
      {download.isError && (
        <Alert tone="error" title="The workbook was not built" className="mt-3">
          {getErrorMessage(download.error)}
        </Alert>
      )}
    </li>
  );
}

function StoredDownload({ report }: { report: StoredReport }) {
  const download = useDownloadWorkbook();
  return (
    <span className="inline-flex flex-col items-end gap-1">
      <Button
        variant="secondary"
        size="sm"
        onClick={() => download.mutate({ url: report.url, fallbackName: report.file })}
        loading={download.isPending}
        aria-label={`Download ${report.file} of ${report.date}`}
      >
        <DownloadIcon />
        Download
      </Button>
      {download.isError && <span className="text-xs text-ember-700">{getErrorMessage(download.error)}</span>}
    </span>
  );
}

const storedColumns: Column<StoredReport>[] = [
  { id: 'date', header: 'Written on', sortValue: (r) => r.date, cell: (r) => <span className="whitespace-nowrap tabular-nums">{r.date}</span> },
  { id: 'name', header: 'Workbook', sortValue: (r) => r.name, cell: (r) => <span className="capitalize">{r.name}</span> },
  { id: 'site', header: 'Site', sortValue: (r) => r.site, cell: (r) => r.site },
  {
    id: 'window',
    header: 'Window',
    sortValue: (r) => r.from,
    cell: (r) => (
      <span className="whitespace-nowrap tabular-nums">
        {r.from} – {r.to}
      </span>
    ),
  },
  { id: 'size', header: 'Size', align: 'right', sortValue: (r) => r.bytes, cell: (r) => <span className="whitespace-nowrap tabular-nums">{formatBytes(r.bytes)}</span> },
  { id: 'modified', header: 'Modified', sortValue: (r) => r.modifiedAt, cell: (r) => <span className="whitespace-nowrap">{formatDateTime(r.modifiedAt)}</span> },
  { id: 'download', header: 'Download', align: 'right', cell: (r) => <StoredDownload report={r} /> },
];

/** The workbooks the role may build for the window in the address, and the stored ones. */
export function ReportsPanel({ window }: { window: KpiWindow }) {
  const { workbooks, stored } = useReports();
  return (
    <div className="space-y-6">
      <Card
        title="Build a workbook"
        description={
          <>
            Built now for {windowText(window)}
            {window.site ? `, site ${window.site}` : ''}. Every figure is the one the KPI pages show for the same window; totals are
            spreadsheet formulas you can follow.
          </>
        }
      >
        {workbooks.length === 0 ? (
          <EmptyState title="No workbook for your role" description="Ask an administrator if you need one of the workbooks." />
        ) : (
          <ul className="grid gap-4 sm:grid-cols-2 xl:grid-cols-3">
            {workbooks.map((w) => (
              <WorkbookCard key={w.name} workbook={w} window={window} />
            ))}
          </ul>
        )}
      </Card>
      <Card title="Stored workbooks" description="Workbooks written into the reports folder by the nightly run or by osmia report, one folder per day, newest first.">
        <Table
          caption={`Stored workbooks: ${stored.length}`}
          hideCaption
          columns={storedColumns}
          rows={stored}
          rowKey={(r) => `${r.date}/${r.file}`}
          pageSize={20}
          dense
          empty={
            <EmptyState
              title="No stored workbooks yet"
              description="The nightly run keeps each day's workbooks in reports/<date>/ on the server; they appear here once it has run."
            />
          }
        />
      </Card>
    </div>
  );
}
