import { Link } from 'react-router-dom';
import { EmptyState } from '../../components/ui/empty-state.tsx';
import { PageHeader } from '../../components/ui/page-header.tsx';

export function NotFoundRoute() {
  return (
    <>
      <title>Not found · Osmia</title>
      <PageHeader title="Page not found" />
      <EmptyState
        title="There is no page at this address"
        description="The link may be old, or the page is not part of Osmia yet."
        action={
          <Link to="/" className="text-sm font-bold text-tide-700 underline underline-offset-2 hover:text-tide-800">
            Go to the dashboard
          </Link>
        }
      />
    </>
  );
}
