import { isRouteErrorResponse, Navigate, useLocation, useRouteError } from 'react-router-dom';
import { ErrorState } from '@/components/ui/states';
import { paths } from '@/config/paths';
import { ApiError } from '@/lib/api-client';

/** A screen that failed in a way it could not show itself; the shell around it keeps working. */
export default function RouteError() {
  const error = useRouteError();
  const location = useLocation();
  if (error instanceof ApiError && error.status === 401) {
    return <Navigate to={paths.signIn.href(`${location.pathname}${location.search}`)} replace />;
  }
  const shown = isRouteErrorResponse(error)
    ? new ApiError(error.status, error.status === 404 ? 'not_found' : 'internal', error.statusText || 'This page could not be shown.')
    : error;
  return <ErrorState error={shown} title="This page could not be shown" onRetry={() => window.location.reload()} />;
}
