import { isRouteErrorResponse, Link, useRouteError } from 'react-router-dom';
import { ApiError } from '../lib/api-client.ts';

/** The error element of every route: "not found", "not allowed", or the server's message. */
export function RouteError() {
  const error = useRouteError();
  let title = 'Something went wrong';
  let message = 'The page could not be shown.';
  if (isRouteErrorResponse(error)) {
    if (error.status === 404) {
      title = 'Not found';
      message = typeof error.data === 'string' && error.data ? error.data : 'There is nothing at this address.';
    } else if (error.status === 403) {
      title = 'Not for your role';
      message = typeof error.data === 'string' && error.data ? error.data : 'Your role may not use this page.';
    } else {
      message = error.statusText || message;
    }
  } else if (error instanceof ApiError) {
    if (error.status === 404) title = 'Not found';
    if (error.status === 403) title = 'Not for your role';
    message = error.message;
  } else if (error instanceof Error) {
    message = error.message;
  }
  return (
    <div className="mx-auto max-w-xl py-16" role="alert">
      <h1 className="text-display font-semibold text-ink-950">{title}</h1>
      <p className="mt-2 text-lead text-ink-700">{message}</p>
      <p className="mt-6"><Link className="font-medium text-weir-700 underline underline-offset-2" to="/sites">Back to sites</Link></p>
    </div>
  );
}
