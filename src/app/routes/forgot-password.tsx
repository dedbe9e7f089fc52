import { ForgotPasswordForm } from '@/features/auth/components/forgot-password-form';
import { PublicPage } from './public-page';

export function ForgotPasswordRoute() {
  return (
    <PublicPage>
      <h1 className="text-display text-ink-900">Forgot your password?</h1>
      <p className="mb-6 mt-1 text-body text-ink-500">Enter the e-mail you sign in with. If it has an account, we send it a link to choose a new password.</p>
      <ForgotPasswordForm />
    </PublicPage>
  );
}
