import { isRouteErrorResponse, Link, useRouteError } from 'react-router-dom';
import { getErrorMessage } from '../../lib/api-client.ts';
import { OsmiaWordmark } from '../layout/osmia-mark.tsx';

/** Shown when a route itself fails (a loader error, a render error no section caught). */
export function RouteErrorRoute() {
  const error = useRouteError();
  const message = isRouteErrorResponse(error) ? `${error.status} ${error.statusText}` : getErrorMessage(error);
  return (
    <main className="mx-auto max-w-xl px-4 py-16">
      <title>Error · Osmia</title>
      <OsmiaWordmark />
      <h1 className="mt-8 text-2xl font-bold text-basin-950">This page could not be shown</h1>
      <p role="alert" className="mt-2 text-basin-800">
        {message}
      </p>
      <div className="mt-6 flex gap-4 text-sm font-bold">
        <button type="button" onClick={() => window.location.reload()} className="rounded text-tide-700 underline underline-offset-2 hover:text-tide-800">
          Reload the page
        </button>
        <Link to="/" className="rounded text-tide-700 underline underline-offset-2 hover:text-tide-800">
          Go to the dashboard
        </Link>
      </div>
    </main>
  );
}
