import { Link, useNavigate } from 'react-router-dom';
import type { User } from '#shared/schemas/users.ts';
import { Badge } from '../../components/ui/badge.tsx';
import { Button } from '../../components/ui/button.tsx';
import { roleLabels } from '../../config/roles.ts';
import { useSignOut } from '../../features/auth/api/sign-out.ts';
import { OsmiaWordmark } from './osmia-mark.tsx';

export function TopBar({ user }: { user: User }) {
  const signOut = useSignOut();
  const navigate = useNavigate();
  return (
    <header className="border-b border-basin-200 bg-white">
      <div className="mx-auto flex h-16 max-w-screen-2xl items-center justify-between gap-4 px-4 sm:px-6">
        <Link to="/" aria-label="Osmia, go to the dashboard" className="rounded-md">
          <OsmiaWordmark />
        </Link>
        <div className="flex min-w-0 items-center gap-3">
          <div className="hidden min-w-0 text-right sm:block">
            <p className="truncate text-sm font-bold text-basin-900">{user.name || user.email}</p>
            {user.name && <p className="truncate text-xs text-basin-600">{user.email}</p>}
          </div>
          <Badge tone="brand">
            <span className="sr-only">Role: </span>
            {roleLabels[user.role]}
          </Badge>
          <Button
            variant="secondary"
            size="sm"
            loading={signOut.isPending}
            onClick={() => signOut.mutate(undefined, { onSuccess: () => navigate('/sign-in', { replace: true }) })}
          >
            Sign out
          </Button>
        </div>
      </div>
    </header>
  );
}
