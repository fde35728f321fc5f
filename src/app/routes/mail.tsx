import type { QueryClient } from '@tanstack/react-query';
import { ErrorBoundary } from '../../components/ui/error-boundary.tsx';
import { PageHeader } from '../../components/ui/page-header.tsx';
import { mailQueryOptions } from '../../features/mail/api/get-mail.ts';
import { MailPanel } from '../../features/mail/components/mail-panel.tsx';
import { pageLoader, RequirePage } from '../guard.tsx';

export const createMailLoader = (queryClient: QueryClient) => pageLoader(queryClient, 'mail', () => [queryClient.prefetchQuery(mailQueryOptions(0))]);

export function MailRoute() {
  return (
    <>
      <title>Mail · Osmia</title>
      <PageHeader title="Mail" description="The digests and alerts the development mail server received, as their readers would see them, and what waits in the outbox." />
      <RequirePage page="mail">
        {() => (
          <ErrorBoundary title="Mail">
            <MailPanel />
          </ErrorBoundary>
        )}
      </RequirePage>
    </>
  );
}
