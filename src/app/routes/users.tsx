import { useQueryClient, type QueryClient } from '@tanstack/react-query';
import { ErrorBoundary } from '../../components/ui/error-boundary.tsx';
import { PageHeader } from '../../components/ui/page-header.tsx';
import { authKeys } from '../../features/auth/api/get-me.ts';
import { usersQueryOptions } from '../../features/users/api/get-users.ts';
import { UsersPanel } from '../../features/users/components/users-panel.tsx';
import { pageLoader, RequirePage } from '../guard.tsx';

export const createUsersLoader = (queryClient: QueryClient) =>
  pageLoader(queryClient, 'users', () => [queryClient.prefetchQuery(usersQueryOptions)]);

export function UsersRoute() {
  const queryClient = useQueryClient();
  return (
    <>
      <title>Users · Osmia</title>
      <PageHeader
        title="Users"
        description="Who may sign in, and with which role. At least one active administrator always remains."
      />
      <RequirePage page="users">
        {(me) => (
          <ErrorBoundary title="Users">
            <UsersPanel
              currentUserId={me.id}
              // A change to one's own account (name, role) changes the top bar and the navigation.
              onChanged={(user) => (user.id === me.id ? queryClient.invalidateQueries({ queryKey: authKeys.me() }) : undefined)}
            />
          </ErrorBoundary>
        )}
      </RequirePage>
    </>
  );
}
