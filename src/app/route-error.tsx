import { isRouteErrorResponse, Link, useRouteError } from 'react-router-dom';
import { Alert } from '@/components/alert';
import { paths } from '@/config/paths';

/** Shown when a page fails to render or load: what happened, and a way back. */
export function RouteError() {
  const error = useRouteError();
  const message = isRouteErrorResponse(error) ? `${error.status} ${error.statusText}` : error instanceof Error ? error.message : 'Unknown error';
  return (
    <div className="mx-auto max-w-xl p-10">
      <Alert tone="error" title="This page could not be shown">
        <p>{message}</p>
        <p className="mt-2">
          <Link className="font-semibold underline" to={paths.home}>
            Back to the overview
          </Link>{' '}
          or reload the page.
        </p>
      </Alert>
    </div>
  );
}
