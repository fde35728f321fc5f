import type { QueryClient } from '@tanstack/react-query';
import { useSearchParams } from 'react-router-dom';
import { ErrorBoundary } from '../../components/ui/error-boundary.tsx';
import { PageHeader } from '../../components/ui/page-header.tsx';
import { WindowFilterBar } from '../../components/window-filter-bar.tsx';
import { reliabilityQueryOptions } from '../../features/reliability/api/get-reliability.ts';
import { ReliabilityPanel } from '../../features/reliability/components/reliability-panel.tsx';
import { reliabilityParams } from '../../features/reliability/utils/params.ts';
import { useSettings } from '../../features/settings/api/get-settings.ts';
import { pageLoader, RequirePage } from '../guard.tsx';
import { prefetchWithSettings } from '../plant-settings.ts';

export const createReliabilityLoader = (queryClient: QueryClient) =>
  pageLoader(queryClient, 'reliability', (_user, url) => [
    prefetchWithSettings(queryClient, (s) => [queryClient.prefetchQuery(reliabilityQueryOptions(reliabilityParams(url.searchParams, s.confidence)))]),
  ]);

function ReliabilityPage() {
  const settings = useSettings();
  const [search] = useSearchParams();
  const params = reliabilityParams(search, settings.confidence);
  return (
    <>
      <WindowFilterBar asset confidence defaultConfidence={settings.confidence} />
      <ErrorBoundary title="Reliability">
        <ReliabilityPanel params={params} />
      </ErrorBoundary>
    </>
  );
}

export function ReliabilityRoute() {
  return (
    <>
      <title>Reliability · Osmia</title>
      <PageHeader
        title="Reliability"
        description="How often assets fail and how long they take to restore: MTBF with confidence bounds, MTTR and availability, per asset."
      />
      <RequirePage page="reliability">
        {() => (
          <ErrorBoundary title="Settings">
            <ReliabilityPage />
          </ErrorBoundary>
        )}
      </RequirePage>
    </>
  );
}
