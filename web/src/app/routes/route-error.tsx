import { isRouteErrorResponse, Link, useRouteError } from 'react-router-dom';
import { ErrorState } from '../../components/ui/page-state';
import { ApiError } from '../../lib/api-client';

/** Last resort for loader failures and render crashes: say what happened in words. */
export function RouteError() {
  const error = useRouteError();
  const title =
    error instanceof ApiError && error.status === 0
      ? 'Cannot reach the Ferrisight server'
      : isRouteErrorResponse(error) && error.status === 404
        ? 'Nothing here'
        : 'This screen failed';
  const detail =
    error instanceof ApiError
      ? error.detail
      : isRouteErrorResponse(error)
        ? error.statusText
        : 'An unexpected error stopped this screen. Reloading usually helps; if not, tell your administrator.';
  return (
    <div className="min-h-full bg-canvas p-6">
      <ErrorState title={title} detail={detail} onRetry={() => window.location.reload()}>
        <Link to="/" className="mt-3 inline-block text-info-ink underline">
          Go to the Floor
        </Link>
      </ErrorState>
    </div>
  );
}
