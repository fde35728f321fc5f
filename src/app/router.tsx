import type { QueryClient } from '@tanstack/react-query';
import { useState } from 'react';
import { createBrowserRouter, RouterProvider } from 'react-router-dom';
import { pageById } from '../config/navigation.ts';
import { requireUser } from './guard.tsx';
import { AppShell } from './layout/app-shell.tsx';
import { LoadingShell } from './layout/loading-shell.tsx';
import { RouteErrorRoute } from './routes/route-error.tsx';
import { showZoneOfPage } from './site-zone.ts';

// Pages load on demand: each route module brings its loader (built around the app's query client,
// prefetching the queryOptions its components read) and its component. Only pages whose entry in
// config/navigation.ts is ready have a route here. A full load renders the top-level route's
// HydrateFallback (the loading shell) until the first loaders have run, never a blank page.
const relative = (path: string) => path.replace(/^\//, '');

export function createAppRouter(queryClient: QueryClient) {
  return createBrowserRouter([
    {
      path: '/sign-in',
      HydrateFallback: LoadingShell,
      errorElement: <RouteErrorRoute />,
      lazy: () => import('./routes/sign-in.tsx').then((m) => ({ loader: m.createSignInLoader(queryClient), Component: m.SignInRoute })),
    },
    {
      path: '/',
      element: <AppShell />,
      HydrateFallback: LoadingShell,
      errorElement: <RouteErrorRoute />,
      loader: async ({ request }) => {
        await requireUser(queryClient, request);
        await showZoneOfPage(queryClient, request);
        return null;
      },
      children: [
        {
          index: true,
          lazy: () =>
            import('./routes/dashboard.tsx').then((m) => ({ loader: m.createDashboardLoader(queryClient), Component: m.DashboardRoute })),
        },
        {
          path: relative(pageById('reliability').path),
          lazy: () =>
            import('./routes/reliability.tsx').then((m) => ({ loader: m.createReliabilityLoader(queryClient), Component: m.ReliabilityRoute })),
        },
        {
          path: relative(pageById('element-life').path),
          lazy: () =>
            import('./routes/element-life.tsx').then((m) => ({ loader: m.createElementLifeLoader(queryClient), Component: m.ElementLifeRoute })),
        },
        {
          path: relative(pageById('time-to-complete').path),
          lazy: () =>
            import('./routes/time-to-complete.tsx').then((m) => ({
              loader: m.createTimeToCompleteLoader(queryClient),
              Component: m.TimeToCompleteRoute,
            })),
        },
        {
          path: relative(pageById('downtime').path),
          lazy: () => import('./routes/downtime.tsx').then((m) => ({ loader: m.createDowntimeLoader(queryClient), Component: m.DowntimeRoute })),
        },
        {
          path: relative(pageById('performance').path),
          lazy: () =>
            import('./routes/performance.tsx').then((m) => ({ loader: m.createPerformanceLoader(queryClient), Component: m.PerformanceRoute })),
        },
        {
          path: relative(pageById('imports').path),
          lazy: () => import('./routes/imports.tsx').then((m) => ({ loader: m.createImportsLoader(queryClient), Component: m.ImportsRoute })),
        },
        {
          path: relative(pageById('reports').path),
          lazy: () => import('./routes/reports.tsx').then((m) => ({ loader: m.createReportsLoader(queryClient), Component: m.ReportsRoute })),
        },
        {
          path: relative(pageById('nightly').path),
          lazy: () => import('./routes/nightly.tsx').then((m) => ({ loader: m.createNightlyLoader(queryClient), Component: m.NightlyRoute })),
        },
        {
          path: relative(pageById('mail').path),
          lazy: () => import('./routes/mail.tsx').then((m) => ({ loader: m.createMailLoader(queryClient), Component: m.MailRoute })),
        },
        {
          path: relative(pageById('users').path),
          lazy: () => import('./routes/users.tsx').then((m) => ({ loader: m.createUsersLoader(queryClient), Component: m.UsersRoute })),
        },
        {
          path: relative(pageById('settings').path),
          lazy: () =>
            import('./routes/settings.tsx').then((m) => ({ loader: m.createSettingsLoader(queryClient), Component: m.SettingsRoute })),
        },
        {
          path: '*',
          lazy: () => import('./routes/not-found.tsx').then((m) => ({ Component: m.NotFoundRoute })),
        },
      ],
    },
  ]);
}

export function AppRouter({ queryClient }: { queryClient: QueryClient }) {
  const [router] = useState(() => createAppRouter(queryClient));
  return <RouterProvider router={router} />;
}
