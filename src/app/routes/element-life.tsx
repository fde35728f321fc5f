import type { QueryClient } from '@tanstack/react-query';
import { useSearchParams } from 'react-router-dom';
import { ErrorBoundary } from '../../components/ui/error-boundary.tsx';
import { PageHeader } from '../../components/ui/page-header.tsx';
import { WindowFilterBar } from '../../components/window-filter-bar.tsx';
import { elementLifeQueryOptions } from '../../features/element-life/api/get-element-life.ts';
import { forecastQueryOptions } from '../../features/element-life/api/get-forecast.ts';
import { ElementLifePanel } from '../../features/element-life/components/element-life-panel.tsx';
import { ForecastPanel } from '../../features/element-life/components/forecast-panel.tsx';
import { elementLifeParams } from '../../features/element-life/utils/params.ts';
import { useSettings } from '../../features/settings/api/get-settings.ts';
import { pageLoader, RequirePage } from '../guard.tsx';
import { prefetchWithSettings } from '../plant-settings.ts';

export const createElementLifeLoader = (queryClient: QueryClient) =>
  pageLoader(queryClient, 'element-life', (_user, url) => [
    prefetchWithSettings(queryClient, (s) => {
      const params = elementLifeParams(url.searchParams, s.confidence);
      return [queryClient.prefetchQuery(elementLifeQueryOptions(params)), queryClient.prefetchQuery(forecastQueryOptions(params))];
    }),
  ]);

function ElementLifePage() {
  const settings = useSettings();
  const [search] = useSearchParams();
  const params = elementLifeParams(search, settings.confidence);
  return (
    <>
      <WindowFilterBar asset confidence defaultConfidence={settings.confidence} />
      <div className="space-y-6">
        <ErrorBoundary title="Replacement forecast">
          <ForecastPanel params={params} currency={settings.currency} />
        </ErrorBoundary>
        <ErrorBoundary title="Element life">
          <ElementLifePanel params={params} />
        </ErrorBoundary>
      </div>
    </>
  );
}

export function ElementLifeRoute() {
  return (
    <>
      <title>Element life & forecast · Osmia</title>
      <PageHeader
        title="Element life & forecast"
        description="How long membrane elements last, by train, stage, vessel position or model, and how many will need replacing in the next 12 months."
      />
      <RequirePage page="element-life">
        {() => (
          <ErrorBoundary title="Settings">
            <ElementLifePage />
          </ErrorBoundary>
        )}
      </RequirePage>
    </>
  );
}
