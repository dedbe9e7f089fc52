import { zodResolver } from '@hookform/resolvers/zod';
import { useForm } from 'react-hook-form';
import { signInInputSchema } from '@shared/schemas/auth';
import type { SessionUser } from '@shared/schemas/people';
import { Button } from '@/components/ui/button';
import { Notice } from '@/components/ui/feedback';
import { TextField } from '@/components/ui/field';
import { useSignIn } from '../api/auth.mutations';

export function SignInForm({ onSignedIn }: { onSignedIn: (user: SessionUser) => void }) {
  const signIn = useSignIn();
  const { register, handleSubmit, formState } = useForm({
    resolver: zodResolver(signInInputSchema),
    defaultValues: { email: '', password: '' },
  });

  const submit = handleSubmit((values) => signIn.mutate(values, { onSuccess: ({ user }) => onSignedIn(user) }));

  return (
    <form onSubmit={submit} noValidate className="flex flex-col gap-4" aria-label="Sign in">
      {signIn.error ? <Notice tone="fault">{signIn.error.message}</Notice> : null}
      <TextField
        label="E-mail"
        type="email"
        autoComplete="username"
        autoFocus
        error={formState.errors.email?.message}
        {...register('email')}
      />
      <TextField
        label="Password"
        type="password"
        autoComplete="current-password"
        error={formState.errors.password?.message}
        {...register('password')}
      />
      <Button type="submit" disabled={signIn.isPending} className="mt-1">
        {signIn.isPending ? 'Signing in…' : 'Sign in'}
      </Button>
    </form>
  );
}
