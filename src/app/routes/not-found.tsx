import { Link, useLocation } from 'react-router-dom';

export function NotFoundRoute() {
  const location = useLocation();
  return (
    <div className="py-10">
      <h1 className="text-display text-ink-900">Page not found</h1>
      <p className="mt-3 text-lead text-ink-600">
        Nothing lives at <code className="rounded bg-ptfe-200 px-1.5 font-mono text-body">{location.pathname}</code>.
      </p>
      <Link to="/" className="mt-6 inline-block font-semibold text-phase-700 underline underline-offset-4">
        Back to the overview
      </Link>
    </div>
  );
}
