import type { QueryClient } from '@tanstack/react-query';
import { useSearchParams } from 'react-router-dom';
import { ErrorBoundary } from '../../components/ui/error-boundary.tsx';
import { PageHeader } from '../../components/ui/page-header.tsx';
import { WindowFilterBar } from '../../components/window-filter-bar.tsx';
import { readKpiWindow } from '../../lib/kpi-window.ts';
import { downtimeQueryOptions } from '../../features/downtime/api/get-downtime.ts';
import { DowntimePanel } from '../../features/downtime/components/downtime-panel.tsx';
import { settingsQueryOptions, useSettings } from '../../features/settings/api/get-settings.ts';
import { pageLoader, RequirePage } from '../guard.tsx';

export const createDowntimeLoader = (queryClient: QueryClient) =>
  pageLoader(queryClient, 'downtime', (_user, url) => [
    queryClient.prefetchQuery(settingsQueryOptions),
    queryClient.prefetchQuery(downtimeQueryOptions(readKpiWindow(url.searchParams))),
  ]);

function DowntimePage() {
  const settings = useSettings();
  const [search] = useSearchParams();
  return (
    <>
      <WindowFilterBar asset />
      <ErrorBoundary title="Downtime">
        <DowntimePanel params={readKpiWindow(search)} currency={settings.currency} />
      </ErrorBoundary>
    </>
  );
}

export function DowntimeRoute() {
  return (
    <>
      <title>Downtime · Osmia</title>
      <PageHeader title="Downtime" description="Why and where the plant stopped, planned or not, and what the lost permeate cost." />
      <RequirePage page="downtime">
        {() => (
          <ErrorBoundary title="Settings">
            <DowntimePage />
          </ErrorBoundary>
        )}
      </RequirePage>
    </>
  );
}
