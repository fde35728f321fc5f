import type { QueryClient } from '@tanstack/react-query';
import { redirect, useNavigate, useSearchParams } from 'react-router-dom';
import { Card } from '../../components/ui/card.tsx';
import { authKeys, meQueryOptions } from '../../features/auth/api/get-me.ts';
import { SignInForm } from '../../features/auth/components/sign-in-form.tsx';
import { safeRedirect } from '../guard.tsx';
import { OsmiaWordmark } from '../layout/osmia-mark.tsx';

/**
 * Someone signed in goes straight on to where they were headed; without a session, whatever the last
 * user loaded is dropped. A cached user is asked about afresh (they may have just signed out); a
 * cached "no session" was learnt a moment ago, on the way here.
 */
export const createSignInLoader =
  (queryClient: QueryClient) =>
  async ({ request }: { request: Request }) => {
    const known = queryClient.getQueryData(meQueryOptions.queryKey);
    const user = known === null ? null : await queryClient.fetchQuery({ ...meQueryOptions, staleTime: 0 });
    if (user) throw redirect(safeRedirect(new URL(request.url).searchParams.get('redirectTo')));
    queryClient.removeQueries({ predicate: (q) => q.queryKey[0] !== authKeys.all[0] });
    return null;
  };

export function SignInRoute() {
  const [params] = useSearchParams();
  const navigate = useNavigate();
  const target = safeRedirect(params.get('redirectTo'));
  return (
    <main className="flex min-h-screen flex-col items-center justify-center bg-gradient-to-b from-tide-50 to-basin-50 px-4 py-12">
      <title>Sign in · Osmia</title>
      <div className="w-full max-w-sm">
        <div className="mb-6 flex flex-col items-center gap-2 text-center">
          <OsmiaWordmark size="lg" />
          <p className="text-sm text-basin-600">Maintenance KPIs for membrane water treatment</p>
        </div>
        <Card>
          <h1 className="mb-4 text-lg font-bold text-basin-950">Sign in</h1>
          <SignInForm onSignedIn={() => navigate(target, { replace: true })} />
        </Card>
        {target !== '/' && <p className="mt-4 text-center text-sm text-basin-600">After signing in you go on to {target}.</p>}
      </div>
    </main>
  );
}
