import type { QueryClient } from '@tanstack/react-query';
import { ErrorBoundary } from '../../components/ui/error-boundary.tsx';
import { PageHeader } from '../../components/ui/page-header.tsx';
import { nightlyRunsQueryOptions } from '../../features/nightly/api/get-nightly-runs.ts';
import { NightlyRunsPanel } from '../../features/nightly/components/nightly-runs-panel.tsx';
import { pageLoader, RequirePage } from '../guard.tsx';

export const createNightlyLoader = (queryClient: QueryClient) => pageLoader(queryClient, 'nightly', () => [queryClient.prefetchQuery(nightlyRunsQueryOptions(0))]);

export function NightlyRoute() {
  return (
    <>
      <title>Nightly runs · Osmia</title>
      <PageHeader
        title="Nightly runs"
        description="Each run imports the files waiting in the inbox, refreshes the derived data once, and mails the digest and alerts. Imported files move to done/, refused ones to failed/ with the reason beside them."
      />
      <RequirePage page="nightly">
        {() => (
          <ErrorBoundary title="Nightly runs">
            <NightlyRunsPanel />
          </ErrorBoundary>
        )}
      </RequirePage>
    </>
  );
}
