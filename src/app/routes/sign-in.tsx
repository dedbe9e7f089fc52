import { Link, useNavigate, useSearchParams } from 'react-router-dom';
import { Notice } from '@/components/ui/feedback';
import { SignInForm } from '@/features/auth/components/sign-in-form';
import { PublicPage } from './public-page';

/** Only same-site paths are followed after sign-in. */
function safeNext(next: string | null): string {
  return next && next.startsWith('/') && !next.startsWith('//') ? next : '/';
}

export function SignInRoute() {
  const [params] = useSearchParams();
  const navigate = useNavigate();
  return (
    <PublicPage>
      <h1 className="text-display text-ink-900">Sign in</h1>
      <p className="mb-6 mt-1 text-body text-ink-500">Use the account your lab manager created for you.</p>
      {params.get('notice') === 'password-changed' ? (
        <div className="mb-5">
          <Notice tone="pass">Your password was changed and you were signed out everywhere. Sign in with the new password.</Notice>
        </div>
      ) : null}
      <SignInForm onSignedIn={() => navigate(safeNext(params.get('next')), { replace: true })} />
      <p className="mt-5 text-body">
        <Link to="/forgot-password" className="font-semibold text-phase-700 underline underline-offset-4">
          Forgot your password?
        </Link>
      </p>
    </PublicPage>
  );
}
