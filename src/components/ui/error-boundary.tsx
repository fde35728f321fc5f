import { QueryErrorResetBoundary } from '@tanstack/react-query';
import { Component, Suspense, type ErrorInfo, type ReactNode } from 'react';
import { Link, useLocation } from 'react-router-dom';
import { getErrorMessage, isApiError } from '../../lib/api-client.ts';
import { Alert } from './alert.tsx';
import { Button } from './button.tsx';
import { Spinner } from './spinner.tsx';

interface BoundaryProps {
  /** What failed, in words: "Users", "Server health". */
  title: string;
  onReset: () => void;
  children: ReactNode;
}

interface BoundaryState {
  error: unknown;
  failed: boolean;
}

class Boundary extends Component<BoundaryProps, BoundaryState> {
  override state: BoundaryState = { error: null, failed: false };

  static getDerivedStateFromError(error: unknown): BoundaryState {
    return { error, failed: true };
  }

  override componentDidCatch(_error: unknown, _info: ErrorInfo) {
    // React reports the error itself (createRoot's onCaughtError); the fallback says what happened.
  }

  private reset = () => {
    this.props.onReset();
    this.setState({ error: null, failed: false });
  };

  override render() {
    if (!this.state.failed) return this.props.children;
    return <SectionError title={this.props.title} error={this.state.error} onRetry={this.reset} />;
  }
}

function SignInAgainLink() {
  const location = useLocation();
  const back = encodeURIComponent(location.pathname + location.search);
  return (
    <Link to={`/sign-in?redirectTo=${back}`} className="font-bold text-tide-700 underline underline-offset-2">
      Sign in again
    </Link>
  );
}

/** What a failed section shows, chosen by the HTTP status of the error. */
export function SectionError({ title, error, onRetry }: { title: string; error: unknown; onRetry?: () => void }) {
  if (isApiError(error, 401)) {
    return (
      <Alert tone="warning" title={`${title}: your session has ended`}>
        <p>
          {getErrorMessage(error)} <SignInAgainLink />
        </p>
      </Alert>
    );
  }
  // A fresh server holds no plant yet: not a failure, the data simply is not there.
  if (isApiError(error, 404) && error.code === 'site-not-found') {
    return (
      <Alert tone="info" title={`${title}: no plant data yet`}>
        {getErrorMessage(error)}
      </Alert>
    );
  }
  if (isApiError(error, 403)) {
    return (
      <Alert tone="warning" title={`${title}: not available to your role`}>
        {getErrorMessage(error)}
      </Alert>
    );
  }
  return (
    <Alert tone="error" title={`${title} could not be shown`}>
      <p>{getErrorMessage(error)}</p>
      {onRetry && (
        <Button variant="secondary" size="sm" className="mt-2" onClick={onRetry}>
          Try again
        </Button>
      )}
    </Alert>
  );
}

/**
 * Wraps one section of a page: while its data loads it shows a spinner, and when it fails only the
 * section shows the error (with a retry that refetches), not the whole page.
 */
export function ErrorBoundary({ title, children }: { title: string; children: ReactNode }) {
  return (
    <QueryErrorResetBoundary>
      {({ reset }) => (
        <Boundary title={title} onReset={reset}>
          <Suspense
            fallback={
              <div className="flex justify-center py-8">
                <Spinner label={`Loading ${title.toLowerCase()}…`} />
              </div>
            }
          >
            {children}
          </Suspense>
        </Boundary>
      )}
    </QueryErrorResetBoundary>
  );
}
