import type { QueryClient } from '@tanstack/react-query';
import { Alert } from '../../components/ui/alert.tsx';
import { ErrorBoundary } from '../../components/ui/error-boundary.tsx';
import { PageHeader } from '../../components/ui/page-header.tsx';
import { canEdit } from '../../config/navigation.ts';
import { DigestSubscription } from '../../features/auth/components/digest-subscription.tsx';
import { settingsQueryOptions } from '../../features/settings/api/get-settings.ts';
import { SettingsForm } from '../../features/settings/components/settings-form.tsx';
import { SettingsSummary } from '../../features/settings/components/settings-summary.tsx';
import { pageLoader, RequirePage } from '../guard.tsx';

export const createSettingsLoader = (queryClient: QueryClient) =>
  pageLoader(queryClient, 'settings', () => [queryClient.prefetchQuery(settingsQueryOptions)]);

export function SettingsRoute() {
  return (
    <>
      <title>Settings · Osmia</title>
      <PageHeader title="Settings" description="Cost rates, statistics, normalization constants, alert thresholds and digest recipients of this plant." />
      <RequirePage page="settings">
        {(user) => (
          <div className="space-y-6">
            <DigestSubscription user={user} />
            <ErrorBoundary title="Settings">
              {canEdit(user.role, 'settings') ? (
                <SettingsForm />
              ) : (
                <div className="space-y-6">
                  <Alert tone="info">Only an administrator can change these settings.</Alert>
                  <SettingsSummary />
                </div>
              )}
            </ErrorBoundary>
          </div>
        )}
      </RequirePage>
    </>
  );
}
