import type { QueryClient } from '@tanstack/react-query';
import { redirect, useNavigate, useSearchParams } from 'react-router-dom';
import { Card } from '../../components/ui/card.tsx';
import { meQueryOptions } from '../../features/auth/api/get-me.ts';
import { SignInForm } from '../../features/auth/components/sign-in-form.tsx';
import { safeRedirect } from '../guard.tsx';
import { OsmiaWordmark } from '../layout/osmia-mark.tsx';

/** Someone already signed in goes straight on to where they were headed. */
export const createSignInLoader =
  (queryClient: QueryClient) =>
  async ({ request }: { request: Request }) => {
    const user = await queryClient.ensureQueryData(meQueryOptions);
    if (user) throw redirect(safeRedirect(new URL(request.url).searchParams.get('redirectTo')));
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
          <OsmiaWordmark className="[&_span]:text-2xl" />
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
