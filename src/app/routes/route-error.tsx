import { isRouteErrorResponse, Link, useRouteError } from 'react-router-dom';
import { ApiError } from '@/lib/api-client';

/** The error boundary of every route: a readable message and a way back, never a stack trace. */
export function RouteError() {
  const error = useRouteError();
  let title = 'Something went wrong';
  let message = 'This page could not be shown. Reload to try again; if it keeps happening, tell the lab manager.';
  if (isRouteErrorResponse(error)) {
    if (error.status === 403) {
      title = 'Not available for your role';
      message = typeof error.data === 'string' ? error.data : 'Your role does not include this page.';
    } else if (error.status === 404) {
      title = 'Page not found';
      message = 'There is nothing at this address.';
    }
  } else if (error instanceof ApiError) {
    message = error.message;
  }
  return (
    <div className="mx-auto max-w-xl px-5 py-16">
      <p className="text-caption font-semibold uppercase tracking-widest text-copper-600">Skewbench</p>
      <h1 className="mt-2 text-display text-ink-900">{title}</h1>
      <p className="mt-3 text-lead text-ink-600">{message}</p>
      <Link to="/" className="mt-6 inline-block font-semibold text-phase-700 underline underline-offset-4">
        Back to the overview
      </Link>
    </div>
  );
}
