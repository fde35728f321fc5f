import type { QueryClient } from '@tanstack/react-query';
import { ErrorBoundary } from '../../components/ui/error-boundary.tsx';
import { PageHeader } from '../../components/ui/page-header.tsx';
import { importsQueryOptions } from '../../features/imports/api/get-imports.ts';
import { ImportsPanel } from '../../features/imports/components/imports-panel.tsx';
import { pageLoader, RequirePage } from '../guard.tsx';

export const createImportsLoader = (queryClient: QueryClient) => pageLoader(queryClient, 'imports', () => [queryClient.prefetchQuery(importsQueryOptions)]);

export function ImportsRoute() {
  return (
    <>
      <title>Imports · Osmia</title>
      <PageHeader
        title="Imports"
        description="Bring historian exports, registers, work orders and job steps into Osmia, and see what each import kept and rejected."
      />
      <RequirePage page="imports">
        {() => (
          <ErrorBoundary title="Imports">
            <ImportsPanel />
          </ErrorBoundary>
        )}
      </RequirePage>
    </>
  );
}
