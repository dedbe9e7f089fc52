import { useQuery } from '@tanstack/react-query';
import { roleLabels } from '@shared/domain/roles';
import type { SessionUser } from '@shared/schemas/people';
import { Loading, Notice } from '@/components/ui/feedback';
import { Fact } from '@/components/ui/fact';
import { useAcceptInvitation } from '../api/auth.mutations';
import { invitationOptions } from '../api/auth.queries';
import { ChoosePasswordForm } from './choose-password-form';
import { isLinkProblem, LinkProblem } from './link-problem';

function formatWhen(instant: string, timeZone: string | undefined) {
  return new Intl.DateTimeFormat(undefined, {
    weekday: 'long',
    day: 'numeric',
    month: 'long',
    year: 'numeric',
    hour: '2-digit',
    minute: '2-digit',
    timeZoneName: 'short',
    timeZone,
  }).format(new Date(instant));
}

/** An invitation link: who is invited to which lab with which role, and the password to choose. */
export function AcceptInvitation({ token, timeZone, onAccepted }: { token: string; timeZone?: string; onAccepted: (user: SessionUser) => void }) {
  const invitation = useQuery(invitationOptions(token));
  const accept = useAcceptInvitation();

  if (invitation.isPending) return <Loading label="Opening your invitation…" />;
  if (invitation.isError || isLinkProblem(accept.error)) {
    const error = isLinkProblem(accept.error) ? accept.error : invitation.error;
    if (isLinkProblem(error)) return <LinkProblem error={error} kind="invitation" />;
    return <Notice tone="fault">{error?.message}</Notice>;
  }
  const info = invitation.data;
  return (
    <div className="flex flex-col gap-6">
      <div>
        <h1 className="text-display text-ink-900">Welcome, {info.name.split(' ')[0]}</h1>
        <p className="mt-1 text-body text-ink-500">
          You are invited to Skewbench at {info.labName}. Choose a password to finish your account; you are signed in straight away.
        </p>
      </div>
      <dl className="grid grid-cols-2 gap-x-4 gap-y-3 rounded-panel bg-ptfe-100 p-4 ring-1 ring-ptfe-300">
        <Fact label="Lab">{info.labName}</Fact>
        <Fact label="Role">{roleLabels[info.role]}</Fact>
        <Fact label="Name">{info.name}</Fact>
        <Fact label="Sign-in e-mail">{info.email}</Fact>
        <div className="col-span-2">
          <Fact label="Link valid until">{formatWhen(info.expiresAt, timeZone)}</Fact>
        </div>
      </dl>
      <ChoosePasswordForm
        email={info.email}
        label="Choose your password"
        submitLabel="Set password and sign in"
        pendingLabel="Setting your password…"
        onSubmit={(password) => accept.mutateAsync({ token, password }, { onSuccess: ({ user }) => onAccepted(user) })}
      />
    </div>
  );
}
