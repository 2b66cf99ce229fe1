import { Navigate, isRouteErrorResponse, useLocation, useRouteError } from 'react-router-dom';
import { Button } from '@/components/ui/button';
import { ErrorState } from '@/components/ui/states';
import { isApiError } from '@/lib/api-client';
import { NotFoundPage } from './not-found-page';

/**
 * The error element of every route: a 404 from the router or the API becomes the 404 page, a 401
 * sends the user to sign in (coming back afterwards), anything else says what failed.
 */
export function RouteError() {
  const error = useRouteError();
  const location = useLocation();
  if ((isRouteErrorResponse(error) && error.status === 404) || isApiError(error, 404)) return <NotFoundPage />;
  if ((isRouteErrorResponse(error) && error.status === 401) || isApiError(error, 401)) {
    const next = location.pathname + location.search;
    return <Navigate to={`/sign-in?next=${encodeURIComponent(next)}`} replace />;
  }
  const message = isApiError(error)
    ? error.message
    : isRouteErrorResponse(error)
      ? `${error.status} ${error.statusText}`
      : error instanceof Error
        ? error.message
        : 'Unknown error';
  const title = isApiError(error, 403) ? 'Your role doesn’t allow this' : 'This page could not be shown';
  return (
    <div className="p-8">
      <ErrorState
        title={title}
        message={message}
        action={
          <Button variant="secondary" size="sm" onClick={() => window.location.reload()}>
            Reload the page
          </Button>
        }
      />
    </div>
  );
}
