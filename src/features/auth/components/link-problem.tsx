import { Link } from 'react-router-dom';
import { ApiError } from '@/lib/api-client';
import { Notice } from '@/components/ui/feedback';

/** True for the API's answer to an unknown, expired or used invitation or reset link. */
export function isLinkProblem(error: unknown): error is ApiError {
  return error instanceof ApiError && error.code === 'token_invalid';
}

/** Why a one-time link does not work (the server's words), and what to do next. */
export function LinkProblem({ error, kind }: { error: unknown; kind: 'invitation' | 'reset' }) {
  const message = error instanceof Error ? error.message : 'This link does not work.';
  return (
    <div className="flex flex-col gap-4">
      <h1 className="text-display text-ink-900">{kind === 'invitation' ? 'This invitation does not work' : 'This reset link does not work'}</h1>
      <Notice tone="caution">{message}</Notice>
      {kind === 'invitation' ? (
        <p className="text-body text-ink-600">
          A lab manager can send a new invitation from the People page. If you already chose a password,{' '}
          <Link to="/sign-in" className="font-semibold text-phase-700 underline underline-offset-4">
            sign in
          </Link>
          .
        </p>
      ) : (
        <p className="flex flex-wrap gap-x-4 gap-y-2 text-body">
          <Link to="/forgot-password" className="font-semibold text-phase-700 underline underline-offset-4">
            Request a new link
          </Link>
          <Link to="/sign-in" className="font-semibold text-phase-700 underline underline-offset-4">
            Back to sign-in
          </Link>
        </p>
      )}
    </div>
  );
}
