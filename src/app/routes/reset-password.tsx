import { useNavigate, useParams } from 'react-router-dom';
import { ResetPassword } from '@/features/auth/components/reset-password';
import { PublicPage } from './public-page';

export function ResetPasswordRoute() {
  const { token = '' } = useParams();
  const navigate = useNavigate();
  return (
    <PublicPage>
      <ResetPassword token={token} onReset={() => navigate('/sign-in?notice=password-changed', { replace: true })} />
    </PublicPage>
  );
}
