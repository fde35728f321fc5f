import type { QueryClient } from '@tanstack/react-query';
import { useSearchParams } from 'react-router-dom';
import { ErrorBoundary } from '../../components/ui/error-boundary.tsx';
import { PageHeader } from '../../components/ui/page-header.tsx';
import { WindowFilterBar } from '../../components/window-filter-bar.tsx';
import { readKpiWindow } from '../../lib/kpi-window.ts';
import { performanceQueryOptions } from '../../features/performance/api/get-performance.ts';
import { PerformancePanel } from '../../features/performance/components/performance-panel.tsx';
import { pageLoader, RequirePage } from '../guard.tsx';

export const createPerformanceLoader = (queryClient: QueryClient) =>
  pageLoader(queryClient, 'performance', (_user, url) => [queryClient.prefetchQuery(performanceQueryOptions(readKpiWindow(url.searchParams)))]);

function PerformancePage() {
  const [search] = useSearchParams();
  return (
    <>
      <WindowFilterBar asset />
      <ErrorBoundary title="Membrane performance">
        <PerformancePanel params={readKpiWindow(search)} />
      </ErrorBoundary>
    </>
  );
}

export function PerformanceRoute() {
  return (
    <>
      <title>Membrane performance · Osmia</title>
      <PageHeader
        title="Membrane performance"
        description="Normalized permeate flow, salt passage and differential pressure of each stage against its baseline, and the alerts that say clean or replace."
      />
      <RequirePage page="performance">{() => <PerformancePage />}</RequirePage>
    </>
  );
}
