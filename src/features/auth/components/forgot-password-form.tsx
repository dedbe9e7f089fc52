import { zodResolver } from '@hookform/resolvers/zod';
import { useState } from 'react';
import { useForm } from 'react-hook-form';
import { Link } from 'react-router-dom';
import { forgotPasswordInputSchema } from '@shared/schemas/auth';
import { Button } from '@/components/ui/button';
import { Notice } from '@/components/ui/feedback';
import { TextField } from '@/components/ui/field';
import { applyServerFieldErrors } from '@/lib/form-errors';
import { useRequestPasswordReset } from '../api/auth.mutations';

/** Ask for a reset link. The answer never says whether the address has an account. */
export function ForgotPasswordForm() {
  const request = useRequestPasswordReset();
  const [banner, setBanner] = useState<string | null>(null);
  const { register, handleSubmit, formState, setError } = useForm({
    resolver: zodResolver(forgotPasswordInputSchema),
    defaultValues: { email: '' },
  });

  const submit = handleSubmit((values) => {
    setBanner(null);
    request.mutate(values, { onError: (error) => setBanner(applyServerFieldErrors(error, setError, ['email']) ? null : error.message) });
  });

  if (request.isSuccess) {
    return (
      <div className="flex flex-col gap-4">
        <Notice tone="info">{request.data.message}</Notice>
        <p className="text-body text-ink-600">
          Nothing in your inbox after a few minutes? Check the spam folder, or ask a lab manager.{' '}
          <Link to="/sign-in" className="font-semibold text-phase-700 underline underline-offset-4">
            Back to sign-in
          </Link>
        </p>
      </div>
    );
  }
  return (
    <form onSubmit={submit} noValidate className="flex flex-col gap-4" aria-label="Request a reset link">
      {banner ? <Notice tone="fault">{banner}</Notice> : null}
      <TextField label="E-mail" type="email" autoComplete="username" autoFocus error={formState.errors.email?.message} {...register('email')} />
      <Button type="submit" disabled={request.isPending} className="mt-1">
        {request.isPending ? 'Sending…' : 'Send me a link'}
      </Button>
      <Link to="/sign-in" className="text-body font-semibold text-phase-700 underline underline-offset-4">
        Back to sign-in
      </Link>
    </form>
  );
}
