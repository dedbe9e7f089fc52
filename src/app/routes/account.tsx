import { Link } from 'react-router-dom';
import { roleLabels } from '@shared/domain/roles';
import { Fact } from '@/components/ui/fact';
import { Panel } from '@/components/ui/feedback';
import { NotificationPreferencesPanel } from '@/features/auth/components/notification-preferences';
import { useSignedInUser } from '@/features/auth/hooks/use-signed-in-user';

export function AccountRoute() {
  const user = useSignedInUser();
  return (
    <div className="space-y-6">
      <div>
        <h1 className="text-display text-ink-900">Your account</h1>
        <p className="mt-1 text-body text-ink-500">Who you are in Skewbench, and which e-mails it sends you.</p>
      </div>
      <div className="grid items-start gap-6 lg:grid-cols-[20rem_1fr]">
        <Panel title="Account">
          <dl className="flex flex-col gap-3">
            <Fact label="Name">{user.name}</Fact>
            <Fact label="E-mail">{user.email}</Fact>
            <Fact label="Role">{roleLabels[user.role]}</Fact>
          </dl>
          <p className="mt-4 text-caption text-ink-500">
            A lab manager changes names and roles. To change your password,{' '}
            <Link to="/forgot-password" className="font-semibold text-phase-700 underline underline-offset-4">
              request a reset link
            </Link>
            : choosing the new password signs you out on every device.
          </p>
        </Panel>
        <NotificationPreferencesPanel />
      </div>
    </div>
  );
}
