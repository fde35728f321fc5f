import type { QueryClient } from '@tanstack/react-query';
import { useSearchParams } from 'react-router-dom';
import { ErrorBoundary } from '../../components/ui/error-boundary.tsx';
import { PageHeader } from '../../components/ui/page-header.tsx';
import { WindowFilterBar } from '../../components/window-filter-bar.tsx';
import { readKpiWindow } from '../../lib/kpi-window.ts';
import { reportsQueryOptions } from '../../features/reports/api/get-reports.ts';
import { ReportsPanel } from '../../features/reports/components/reports-panel.tsx';
import { pageLoader, RequirePage } from '../guard.tsx';

export const createReportsLoader = (queryClient: QueryClient) => pageLoader(queryClient, 'reports', () => [queryClient.prefetchQuery(reportsQueryOptions)]);

function ReportsPage() {
  const [search] = useSearchParams();
  return (
    <>
      <WindowFilterBar />
      <ErrorBoundary title="Reports">
        <ReportsPanel window={readKpiWindow(search)} />
      </ErrorBoundary>
    </>
  );
}

export function ReportsRoute() {
  return (
    <>
      <title>Reports · Osmia</title>
      <PageHeader title="Reports" description="Spreadsheet workbooks of the plant’s figures for a window, to download, check and keep." />
      <RequirePage page="reports">{() => <ReportsPage />}</RequirePage>
    </>
  );
}
