import type { QueryClient } from '@tanstack/react-query';
import { useSearchParams } from 'react-router-dom';
import { ErrorBoundary } from '../../components/ui/error-boundary.tsx';
import { PageHeader } from '../../components/ui/page-header.tsx';
import { WindowFilterBar } from '../../components/window-filter-bar.tsx';
import { readKpiWindow } from '../../lib/kpi-window.ts';
import { timeToCompleteQueryOptions } from '../../features/time-to-complete/api/get-time-to-complete.ts';
import { TimeToCompletePanel } from '../../features/time-to-complete/components/time-to-complete-panel.tsx';
import { pageLoader, RequirePage } from '../guard.tsx';

export const createTimeToCompleteLoader = (queryClient: QueryClient) =>
  pageLoader(queryClient, 'time-to-complete', (_user, url) => [queryClient.prefetchQuery(timeToCompleteQueryOptions(readKpiWindow(url.searchParams)))]);

function TimeToCompletePage() {
  const [search] = useSearchParams();
  return (
    <>
      <WindowFilterBar asset />
      <ErrorBoundary title="Jobs">
        <TimeToCompletePanel params={readKpiWindow(search)} />
      </ErrorBoundary>
    </>
  );
}

export function TimeToCompleteRoute() {
  return (
    <>
      <title>Jobs / time to complete · Osmia</title>
      <PageHeader
        title="Jobs / time to complete"
        description="How long element replacements and other jobs really take, by crew and procedure, and whether crews that follow the written procedure are faster."
      />
      <RequirePage page="time-to-complete">{() => <TimeToCompletePage />}</RequirePage>
    </>
  );
}
