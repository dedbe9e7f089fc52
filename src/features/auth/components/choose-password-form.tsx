import { zodResolver } from '@hookform/resolvers/zod';
import { useState } from 'react';
import { useForm } from 'react-hook-form';
import { choosePasswordFormSchema } from '@shared/schemas/auth';
import { Button } from '@/components/ui/button';
import { Notice } from '@/components/ui/feedback';
import { TextField } from '@/components/ui/field';
import { applyServerFieldErrors } from '@/lib/form-errors';

interface ChoosePasswordFormProps {
  /** The account's e-mail, for password managers (a hidden username field). */
  email: string;
  label: string;
  submitLabel: string;
  pendingLabel: string;
  /** Send the password; a rejection's field messages land on the field, anything else shows above the form. */
  onSubmit: (password: string) => Promise<unknown>;
}

/** A new password, typed twice; only the first is sent. */
export function ChoosePasswordForm({ email, label, submitLabel, pendingLabel, onSubmit }: ChoosePasswordFormProps) {
  const [banner, setBanner] = useState<string | null>(null);
  const { register, handleSubmit, formState, setError } = useForm({
    resolver: zodResolver(choosePasswordFormSchema),
    defaultValues: { password: '', confirm: '' },
  });

  const submit = handleSubmit(async ({ password }) => {
    setBanner(null);
    try {
      await onSubmit(password);
    } catch (error) {
      if (!applyServerFieldErrors(error, setError, ['password'])) setBanner(error instanceof Error ? error.message : 'The password could not be saved.');
    }
  });

  return (
    <form onSubmit={submit} noValidate className="flex flex-col gap-4" aria-label={label}>
      {banner ? <Notice tone="fault">{banner}</Notice> : null}
      <input type="email" name="username" autoComplete="username" value={email} readOnly hidden />
      <TextField
        label="New password"
        type="password"
        autoComplete="new-password"
        autoFocus
        hint="At least 10 characters; a few unrelated words make a good one."
        error={formState.errors.password?.message}
        {...register('password')}
      />
      <TextField label="New password again" type="password" autoComplete="new-password" error={formState.errors.confirm?.message} {...register('confirm')} />
      <Button type="submit" disabled={formState.isSubmitting} className="mt-1">
        {formState.isSubmitting ? pendingLabel : submitLabel}
      </Button>
    </form>
  );
}
