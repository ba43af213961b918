import { isRouteErrorResponse, Link, useRouteError } from 'react-router-dom';
import { Notice } from '@/components/ui/notice';
import { isApiError } from '@/lib/api-client';
import { NotFound } from './not-found';

export function RouteError() {
  const error = useRouteError();
  // A malformed id in the address is refused by validation before any lookup: to the reader it is
  // the same as a record that does not exist.
  const missing = isApiError(error) && (error.status === 404 || (error.status === 400 && error.code === 'validation_failed'));
  if (missing || (isRouteErrorResponse(error) && error.status === 404)) {
    return <NotFound what="record" />;
  }
  const message = isApiError(error)
    ? error.message
    : 'Something went wrong while showing this page. Reloading usually helps; if it keeps happening, tell the workshop.';
  return (
    <div className="mx-auto flex max-w-lg flex-col gap-3 px-gutter py-12">
      <h1 className="text-2xl font-bold">This page could not be shown</h1>
      <Notice tone="problem">
        <p>{message}</p>
        {isApiError(error) && error.requestId ? <p className="text-xs">Reference: {error.requestId}</p> : null}
      </Notice>
      <p>
        <Link to="/">Go to your start page</Link>
      </p>
    </div>
  );
}
