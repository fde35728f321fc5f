import type { QueryClient } from '@tanstack/react-query';
import type { ReactNode } from 'react';
import { Link, useSearchParams } from 'react-router-dom';
import type { User } from '#shared/schemas/users.ts';
import { ErrorBoundary } from '../../components/ui/error-boundary.tsx';
import { PageHeader } from '../../components/ui/page-header.tsx';
import { WindowFilterBar } from '../../components/window-filter-bar.tsx';
import { seesCard } from '../../config/dashboard.ts';
import { canOpen, pageById, type PageId } from '../../config/navigation.ts';
import { cn } from '../../lib/cn.ts';
import { readKpiWindow, toSearch, type KpiWindow } from '../../lib/kpi-window.ts';
import { downtimeQueryOptions } from '../../features/downtime/api/get-downtime.ts';
import { DowntimeSummaryCard } from '../../features/downtime/components/downtime-summary-card.tsx';
import { forecastQueryOptions } from '../../features/element-life/api/get-forecast.ts';
import { ForecastSummaryCard } from '../../features/element-life/components/forecast-summary-card.tsx';
import { healthQueryOptions } from '../../features/health/api/get-health.ts';
import { HealthCard } from '../../features/health/components/health-card.tsx';
import { maintenanceMixQueryOptions } from '../../features/maintenance-mix/api/get-maintenance-mix.ts';
import { MaintenanceMixCard } from '../../features/maintenance-mix/components/maintenance-mix-card.tsx';
import { performanceQueryOptions } from '../../features/performance/api/get-performance.ts';
import { PerformanceAlertsCard } from '../../features/performance/components/performance-alerts-card.tsx';
import { reliabilityQueryOptions } from '../../features/reliability/api/get-reliability.ts';
import { TrainReliabilityCard } from '../../features/reliability/components/train-reliability-card.tsx';
import { useSettings } from '../../features/settings/api/get-settings.ts';
import { openWorkOrdersQueryOptions, type OpenWorkOrdersParams } from '../../features/work-orders/api/get-open-work-orders.ts';
import { OpenWorkCard } from '../../features/work-orders/components/open-work-card.tsx';
import { pageLoader, RequirePage } from '../guard.tsx';
import { prefetchWithSettings } from '../plant-settings.ts';

/** The dashboard looks at the whole site: only the window and the site come from the address. */
function dashboardWindow(search: URLSearchParams, plantConfidence: number): KpiWindow {
  const { site, from, to } = readKpiWindow(search);
  return { site, from, to, confidence: plantConfidence };
}

/** Open work at the end of the dashboard's window: the most pressing eight. */
const openWorkParams = (w: KpiWindow): OpenWorkOrdersParams => ({
  site: w.site,
  to: w.to,
  limit: 8,
});

export const createDashboardLoader = (queryClient: QueryClient) =>
  pageLoader(queryClient, 'dashboard', (user, url) =>
    [
      seesCard(user.role, 'server-health') && queryClient.prefetchQuery(healthQueryOptions),
      seesCard(user.role, 'open-work') && queryClient.prefetchQuery(openWorkOrdersQueryOptions(openWorkParams(readKpiWindow(url.searchParams)))),
      prefetchWithSettings(queryClient, (s) => {
        const w = dashboardWindow(url.searchParams, s.confidence);
        return [
          canOpen(user.role, 'reliability') && queryClient.prefetchQuery(reliabilityQueryOptions({ ...w, groupBy: 'asset' })),
          canOpen(user.role, 'performance') && queryClient.prefetchQuery(performanceQueryOptions(w)),
          queryClient.prefetchQuery(downtimeQueryOptions(w)),
          queryClient.prefetchQuery(forecastQueryOptions({ ...w, groupBy: 'all' })),
          queryClient.prefetchQuery(maintenanceMixQueryOptions(w)),
        ].filter((p) => p !== false);
      }),
    ].filter((p) => p !== false),
  );

/** "Open the page" link of a card, keeping the window so the page shows the same figures in detail. */
function PageLink({ page, user, w, children }: { page: PageId; user: User; w: KpiWindow; children: string }) {
  if (!canOpen(user.role, page) || !pageById(page).ready) return null;
  return (
    <Link
      to={`${pageById(page).path}${toSearch({ site: w.site, from: w.from, to: w.to })}`}
      className="mt-4 inline-block text-sm font-bold text-tide-700 underline underline-offset-2 hover:text-tide-800"
    >
      {children} →
    </Link>
  );
}

/**
 * The half-width cards in a two-column grid, in reading order. With an odd number the last one takes
 * the whole row, so no role's dashboard has a hole in it.
 */
function CardGrid({ cards }: { cards: { key: string; node: ReactNode }[] }) {
  return (
    <div className="grid gap-6 xl:grid-cols-2">
      {cards.map((c, i) => (
        // `grid` lets the card fill the cell, so the two cards of a row are as tall as each other.
        <div key={c.key} className={cn('grid min-w-0', cards.length % 2 === 1 && i === cards.length - 1 && 'xl:col-span-2')}>
          {c.node}
        </div>
      ))}
    </div>
  );
}

function Dashboard({ user }: { user: User }) {
  const settings = useSettings();
  const [search] = useSearchParams();
  const w = dashboardWindow(search, settings.confidence);
  const currency = settings.currency;
  const cards: { key: string; node: ReactNode }[] = [];
  if (canOpen(user.role, 'reliability')) {
    cards.push({
      key: 'trains',
      node: (
        <ErrorBoundary title="Trains">
          <TrainReliabilityCard
            params={w}
            footer={
              <PageLink page="reliability" user={user} w={w}>
                Reliability by asset
              </PageLink>
            }
          />
        </ErrorBoundary>
      ),
    });
  }
  cards.push(
    {
      key: 'maintenance-mix',
      node: (
        <ErrorBoundary title="Maintenance mix">
          <MaintenanceMixCard params={w} currency={currency} />
        </ErrorBoundary>
      ),
    },
    {
      key: 'downtime',
      node: (
        <ErrorBoundary title="Downtime">
          <DowntimeSummaryCard
            params={w}
            currency={currency}
            footer={
              <PageLink page="downtime" user={user} w={w}>
                Downtime in detail
              </PageLink>
            }
          />
        </ErrorBoundary>
      ),
    },
    {
      key: 'forecast',
      node: (
        <ErrorBoundary title="Replacement forecast">
          <ForecastSummaryCard
            params={{ ...w, groupBy: 'all' }}
            currency={currency}
            footer={
              <PageLink page="element-life" user={user} w={w}>
                Element life and the forecast by month
              </PageLink>
            }
          />
        </ErrorBoundary>
      ),
    },
  );
  return (
    <>
      <WindowFilterBar />
      <div className="space-y-6">
        {seesCard(user.role, 'open-work') && (
          <ErrorBoundary title="Open work">
            <OpenWorkCard params={openWorkParams(w)} />
          </ErrorBoundary>
        )}
        <CardGrid cards={cards} />
        {canOpen(user.role, 'performance') && (
          <ErrorBoundary title="Membrane performance alerts">
            <PerformanceAlertsCard
              params={w}
              footer={
                <PageLink page="performance" user={user} w={w}>
                  Normalized performance by stage
                </PageLink>
              }
            />
          </ErrorBoundary>
        )}
        {seesCard(user.role, 'server-health') && (
          <div className="max-w-3xl">
            <ErrorBoundary title="Server health">
              <HealthCard />
            </ErrorBoundary>
          </div>
        )}
      </div>
    </>
  );
}

export function DashboardRoute() {
  return (
    <>
      <title>Dashboard · Osmia</title>
      <PageHeader
        title="Dashboard"
        description="The plant at a glance, as your role follows it: open work, availability, downtime, replacements ahead and their cost, maintenance mix, membrane alerts."
      />
      <RequirePage page="dashboard">
        {(user) => (
          <ErrorBoundary title="Settings">
            <Dashboard user={user} />
          </ErrorBoundary>
        )}
      </RequirePage>
    </>
  );
}
