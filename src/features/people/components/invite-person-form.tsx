import { zodResolver } from '@hookform/resolvers/zod';
import { useState } from 'react';
import { useForm } from 'react-hook-form';
import { roleLabels, roles } from '@shared/domain/roles';
import { inviteUserInputSchema } from '@shared/schemas/people';
import { Button } from '@/components/ui/button';
import { Notice, Panel } from '@/components/ui/feedback';
import { SelectField, TextField } from '@/components/ui/field';
import { applyServerFieldErrors } from '@/lib/form-errors';
import { useInvitePerson } from '../api/people.mutations';

const formFields = ['email', 'name', 'role'] as const;
const day = new Intl.DateTimeFormat(undefined, { dateStyle: 'medium' });

/** The usual way to add someone: they get an e-mail with a link to choose their own password. */
export function InvitePersonForm() {
  const invite = useInvitePerson();
  const [sent, setSent] = useState<string | null>(null);
  const [banner, setBanner] = useState<string | null>(null);
  const { register, handleSubmit, formState, setError, reset } = useForm({
    resolver: zodResolver(inviteUserInputSchema),
    defaultValues: { email: '', name: '', role: 'researcher' as const },
  });

  const submit = handleSubmit((values) => {
    setSent(null);
    setBanner(null);
    invite.mutate(values, {
      onSuccess: ({ user, invitation }) => {
        setSent(
          `${invitation.resent ? 'New invitation' : 'Invitation'} sent to ${user.email}. The link works once, until ${day.format(new Date(invitation.expiresAt))}.`,
        );
        reset();
      },
      onError: (error) => setBanner(applyServerFieldErrors(error, setError, formFields) ? null : error.message),
    });
  });

  const errors = formState.errors;
  return (
    <Panel title="Invite by e-mail">
      <form onSubmit={submit} noValidate className="flex flex-col gap-3" aria-label="Invite by e-mail">
        <p className="text-body text-ink-500">They get a link to choose their own password; it works once, for 7 days.</p>
        {sent ? <Notice tone="pass">{sent}</Notice> : null}
        {banner ? <Notice tone="fault">{banner}</Notice> : null}
        <TextField label="Name" autoComplete="off" error={errors.name?.message} {...register('name')} />
        <TextField label="E-mail" type="email" autoComplete="off" error={errors.email?.message} {...register('email')} />
        <SelectField label="Role" error={errors.role?.message} {...register('role')}>
          {roles.map((role) => (
            <option key={role} value={role}>
              {roleLabels[role]}
            </option>
          ))}
        </SelectField>
        <Button type="submit" disabled={invite.isPending}>
          {invite.isPending ? 'Sending…' : 'Send invitation'}
        </Button>
      </form>
    </Panel>
  );
}
