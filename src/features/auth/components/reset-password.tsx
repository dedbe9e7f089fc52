import { useQuery } from '@tanstack/react-query';
import { Loading, Notice } from '@/components/ui/feedback';
import { useResetPassword } from '../api/auth.mutations';
import { resetLinkOptions } from '../api/auth.queries';
import { ChoosePasswordForm } from './choose-password-form';
import { isLinkProblem, LinkProblem } from './link-problem';

/** A reset link: the new password, typed twice. Saving it signs the person out everywhere. */
export function ResetPassword({ token, onReset }: { token: string; onReset: () => void }) {
  const link = useQuery(resetLinkOptions(token));
  const reset = useResetPassword();

  if (link.isPending) return <Loading label="Checking the link…" />;
  const problem = isLinkProblem(reset.error) ? reset.error : link.error;
  if (problem) return isLinkProblem(problem) ? <LinkProblem error={problem} kind="reset" /> : <Notice tone="fault">{problem.message}</Notice>;
  return (
    <div className="flex flex-col gap-6">
      <div>
        <h1 className="text-display text-ink-900">Choose a new password</h1>
        <p className="mt-1 text-body text-ink-500">
          For <span className="font-semibold text-ink-700">{link.data!.email}</span>. Saving it signs you out on every device; then sign in with the new
          password.
        </p>
      </div>
      <ChoosePasswordForm
        email={link.data!.email}
        label="Choose a new password"
        submitLabel="Save the new password"
        pendingLabel="Saving…"
        onSubmit={(password) => reset.mutateAsync({ token, password }, { onSuccess: onReset })}
      />
    </div>
  );
}
