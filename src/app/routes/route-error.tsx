import { isRouteErrorResponse, useRouteError } from 'react-router-dom';
import { Button } from '@/components/ui/button';
import { ErrorState } from '@/components/ui/error-state';
import { PublicLayout } from '../layout/public-layout';
import { NotFoundRoute } from './not-found';

/** Catches what a screen throws while rendering, so nobody meets a blank page or a stack trace. */
export function RouteErrorBoundary() {
  const error = useRouteError();
  if (isRouteErrorResponse(error) && error.status === 404) {
    return (
      <PublicLayout width="wide">
        <NotFoundRoute />
      </PublicLayout>
    );
  }
  return (
    <PublicLayout>
      <ErrorState title="This screen stopped working" error={error} />
      <Button className="mt-6" onClick={() => window.location.reload()}>
        Reload the page
      </Button>
    </PublicLayout>
  );
}
