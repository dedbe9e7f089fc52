import { useQuery } from '@tanstack/react-query';
import { useNavigate, useParams } from 'react-router-dom';
import { AcceptInvitation } from '@/features/auth/components/accept-invitation';
import { labInfoOptions } from '@/features/lab/api/lab.queries';
import { PublicPage } from './public-page';

export function InvitationRoute() {
  const { token = '' } = useParams();
  const navigate = useNavigate();
  const lab = useQuery(labInfoOptions());
  return (
    <PublicPage>
      <AcceptInvitation token={token} timeZone={lab.data?.timeZone} onAccepted={() => navigate('/', { replace: true })} />
    </PublicPage>
  );
}
