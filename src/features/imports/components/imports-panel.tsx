import { useState } from 'react';
import type { ImportRecord } from '#shared/schemas/imports.ts';
import { Card } from '../../../components/ui/card.tsx';
import { ErrorBoundary } from '../../../components/ui/error-boundary.tsx';
import { ImportHistory } from './import-history.tsx';
import { ImportRecordView } from './import-record-view.tsx';
import { UploadForm } from './upload-form.tsx';

/** Upload a file, see what became of it, and the history of every import. */
export function ImportsPanel() {
  const [result, setResult] = useState<ImportRecord | null>(null);
  return (
    <div className="space-y-6">
      <UploadForm onResult={setResult} />
      {result && (
        <Card title={result.dryRun ? 'Dry run result' : 'Import result'} description={result.dryRun ? 'Nothing was kept: this is what importing the file would do.' : undefined}>
          <ImportRecordView record={result} />
        </Card>
      )}
      <p className="text-sm text-basin-700">
        Every file, uploaded here or imported with <code className="rounded bg-basin-100 px-1 font-mono text-xs">bin/osmia import</code>, is rolled up
        as soon as it lands, so performance, downtime and operating time count it at once; the history says so for each import. A bulk load run
        with <code className="rounded bg-basin-100 px-1 font-mono text-xs">--no-refresh</code> waits for{' '}
        <code className="rounded bg-basin-100 px-1 font-mono text-xs">bin/osmia refresh</code>, and until then the KPI pages say so in a banner.
      </p>
      <ErrorBoundary title="Import history">
        <ImportHistory />
      </ErrorBoundary>
    </div>
  );
}
