import type { QueryClient } from '@tanstack/react-query';
import type { ReactNode } from 'react';
import { Link, redirect } from 'react-router-dom';
import type { User } from '#shared/schemas/users.ts';
import { canOpen, pageById, type PageId } from '../config/navigation.ts';
import { roleLabels } from '../config/roles.ts';
import { meQueryOptions, useMe } from '../features/auth/api/get-me.ts';

/** Where to send a person after sign-in: only a path of this app, never another origin or the sign-in page. */
export function safeRedirect(target: string | null | undefined): string {
  if (!target || !target.startsWith('/') || target.startsWith('//') || target.startsWith('/\\')) return '/';
  if (target === '/sign-in' || target.startsWith('/sign-in?')) return '/';
  return target;
}

/** The signed-in user, or a redirect to /sign-in that comes back to the requested address. */
export async function requireUser(queryClient: QueryClient, request: Request): Promise<User> {
  const user = await queryClient.ensureQueryData(meQueryOptions);
  if (!user) {
    const url = new URL(request.url);
    throw redirect(`/sign-in?redirectTo=${encodeURIComponent(url.pathname + url.search)}`);
  }
  return user;
}

/**
 * Loader of a page of the navigation table: signs the person in first, then warms the page's data
 * (the same queryOptions its components read) when the role may open it. A refused role loads
 * nothing; the page shows <RequirePage>'s panel instead. `url` is the address asked for: the KPI pages
 * read their window and filters from its search parameters.
 */
export function pageLoader(queryClient: QueryClient, page: PageId, prefetch: (user: User, url: URL) => Promise<unknown>[] = () => []) {
  return async ({ request }: { request: Request }) => {
    const user = await requireUser(queryClient, request);
    // prefetchQuery never throws: a failed fetch shows in the section's error boundary, not as a blank page.
    if (canOpen(user.role, page)) await Promise.all(prefetch(user, new URL(request.url)));
    return null;
  };
}

export function ForbiddenPanel({ page, user }: { page: PageId; user: User }) {
  const entry = pageById(page);
  return (
    <section aria-labelledby="forbidden-heading" className="flex gap-4 rounded-lg border border-sand-200 bg-sand-50 p-5">
      <svg viewBox="0 0 24 24" className="mt-0.5 size-6 shrink-0 text-sand-700" fill="none" stroke="currentColor" strokeWidth="2" aria-hidden="true">
        <rect x="4.5" y="10.5" width="15" height="10" rx="2" />
        <path d="M8 10.5V7.5a4 4 0 0 1 8 0v3" />
      </svg>
      <div>
        <h2 id="forbidden-heading" className="text-base font-bold text-sand-800">
          Your role does not allow this page
        </h2>
        <p className="mt-1 text-sm text-basin-800">
          {entry.label} is open to {entry.roles.map((r) => roleLabels[r]).join(', ')}. You are signed in as {user.email} (
          {roleLabels[user.role]}); ask an administrator if you need this page.
        </p>
        <Link to="/" className="mt-3 inline-block text-sm font-bold text-tide-700 underline underline-offset-2 hover:text-tide-800">
          Back to the dashboard
        </Link>
      </div>
    </section>
  );
}

/** Renders the page for the roles of the navigation table, and the refusal panel for the others. */
export function RequirePage({ page, children }: { page: PageId; children: (user: User) => ReactNode }) {
  const user = useMe();
  // Pages render inside the app shell, which sends a person without a session to sign in.
  if (!user) return null;
  if (!canOpen(user.role, page)) return <ForbiddenPanel page={page} user={user} />;
  return children(user);
}
