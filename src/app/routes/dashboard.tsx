import type { QueryClient } from '@tanstack/react-query';
import { Link } from 'react-router-dom';
import type { User } from '#shared/schemas/users.ts';
import { Card } from '../../components/ui/card.tsx';
import { ErrorBoundary } from '../../components/ui/error-boundary.tsx';
import { PageHeader } from '../../components/ui/page-header.tsx';
import { navigationFor } from '../../config/navigation.ts';
import { roleLabels } from '../../config/roles.ts';
import { healthQueryOptions } from '../../features/health/api/get-health.ts';
import { HealthCard } from '../../features/health/components/health-card.tsx';
import { pageLoader, RequirePage } from '../guard.tsx';

export const createDashboardLoader = (queryClient: QueryClient) =>
  pageLoader(queryClient, 'dashboard', () => [queryClient.prefetchQuery(healthQueryOptions)]);

function SignedInCard({ user }: { user: User }) {
  const pages = navigationFor(user.role).filter((p) => p.path !== '/');
  return (
    <Card title="Signed in">
      <dl className="grid gap-x-6 gap-y-3 text-sm sm:grid-cols-3">
        <div>
          <dt className="text-basin-600">User</dt>
          <dd className="mt-0.5 font-bold text-basin-900">{user.name || user.email}</dd>
        </div>
        <div>
          <dt className="text-basin-600">E-mail</dt>
          <dd className="mt-0.5 text-basin-900">{user.email}</dd>
        </div>
        <div>
          <dt className="text-basin-600">Role</dt>
          <dd className="mt-0.5 font-bold text-basin-900">{roleLabels[user.role]}</dd>
        </div>
      </dl>
      {pages.length > 0 && (
        <p className="mt-4 text-sm text-basin-700">
          Your role also opens{' '}
          {pages.map((p, i) => (
            <span key={p.id}>
              {i > 0 && (i === pages.length - 1 ? ' and ' : ', ')}
              <Link to={p.path} className="font-bold text-tide-700 underline underline-offset-2 hover:text-tide-800">
                {p.label}
              </Link>
            </span>
          ))}
          .
        </p>
      )}
    </Card>
  );
}

export function DashboardRoute() {
  return (
    <>
      <title>Dashboard · Osmia</title>
      <PageHeader title="Dashboard" description="The state of this Osmia server and of your account." />
      <RequirePage page="dashboard">
        {(user) => (
          <div className="space-y-6">
            <ErrorBoundary title="Server health">
              <HealthCard />
            </ErrorBoundary>
            <SignedInCard user={user} />
          </div>
        )}
      </RequirePage>
    </>
  );
}
