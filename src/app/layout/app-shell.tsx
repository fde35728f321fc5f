import { Navigate, Outlet, useLocation, useNavigation } from 'react-router-dom';
import { useMe } from '../../features/auth/api/get-me.ts';
import { SideNav } from './side-nav.tsx';
import { TopBar } from './top-bar.tsx';

/** Top bar, the role's navigation and the page; its loader has already required a session. */
export function AppShell() {
  const user = useMe();
  const navigation = useNavigation();
  const location = useLocation();
  // The session ended while the app was open (expired, account disabled): sign in and come back.
  // During a navigation (signing out goes to /sign-in itself) wait for it instead of racing it.
  if (!user) {
    if (navigation.state !== 'idle') return null;
    return <Navigate to={`/sign-in?redirectTo=${encodeURIComponent(location.pathname + location.search)}`} replace />;
  }
  return (
    <div className="flex min-h-screen flex-col">
      <a
        href="#main"
        className="sr-only z-50 rounded-md bg-white px-3 py-2 font-bold text-tide-800 shadow focus:not-sr-only focus:fixed focus:top-2 focus:left-2"
      >
        Skip to the page
      </a>
      <TopBar user={user} />
      <div className="h-0.5">
        {navigation.state !== 'idle' && <div role="progressbar" aria-label="Loading the page" className="h-full animate-pulse bg-tide-500" />}
      </div>
      <div className="mx-auto flex w-full max-w-screen-2xl flex-1 flex-col md:flex-row">
        <SideNav role={user.role} />
        <main id="main" tabIndex={-1} className="min-w-0 flex-1 px-4 py-6 sm:px-6 lg:px-8">
          <Outlet />
        </main>
      </div>
    </div>
  );
}
