import { OsmiaWordmark } from './osmia-mark.tsx';

/**
 * What a full load of any address shows while the router first checks the session and warms the
 * page's data (React Router's HydrateFallback). index.html carries the same markup, so the look is
 * there before any script has run and does not change when React takes over.
 */
export function LoadingShell() {
  return (
    <div role="status" aria-label="Loading Osmia" className="flex min-h-screen flex-col items-center justify-center gap-4 px-4">
      <OsmiaWordmark size="lg" />
      <p className="flex items-center gap-2 text-sm text-basin-600">
        <svg className="size-4 animate-spin" viewBox="0 0 24 24" fill="none" aria-hidden="true">
          <circle cx="12" cy="12" r="9" stroke="currentColor" strokeOpacity="0.25" strokeWidth="3" />
          <path d="M21 12a9 9 0 0 0-9-9" stroke="currentColor" strokeWidth="3" strokeLinecap="round" />
        </svg>
        Loading the page…
      </p>
    </div>
  );
}
