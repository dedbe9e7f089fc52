import { zodResolver } from '@hookform/resolvers/zod';
import { useState } from 'react';
import { useForm } from 'react-hook-form';
import { roleLabels, roles } from '@shared/domain/roles';
import { createUserInputSchema, type User } from '@shared/schemas/people';
import { Button } from '@/components/ui/button';
import { Notice, Panel } from '@/components/ui/feedback';
import { SelectField, TextField } from '@/components/ui/field';
import { ApiError } from '@/lib/api-client';
import { useCreatePerson } from '../api/people.mutations';

type FormField = 'email' | 'name' | 'role' | 'password';
const formFields: FormField[] = ['email', 'name', 'role', 'password'];

export function AddPersonForm() {
  const create = useCreatePerson();
  const [created, setCreated] = useState<User | null>(null);
  const { register, handleSubmit, formState, setError, reset } = useForm({
    resolver: zodResolver(createUserInputSchema),
    defaultValues: { email: '', name: '', role: 'researcher' as const, password: '' },
  });

  const submit = handleSubmit((values) => {
    setCreated(null);
    create.mutate(values, {
      onSuccess: ({ user }) => {
        setCreated(user);
        reset();
      },
      onError: (error) => {
        if (error instanceof ApiError) {
          for (const issue of error.fieldIssues) {
            if ((formFields as string[]).includes(issue.path)) setError(issue.path as FormField, { message: issue.message });
          }
        }
      },
    });
  });

  const errors = formState.errors;
  const generalError = create.error instanceof ApiError && create.error.fieldIssues.length ? null : create.error;
  return (
    <Panel title="Add a person">
      <form onSubmit={submit} noValidate className="flex flex-col gap-3" aria-label="Add a person">
        {created ? <Notice tone="pass">Account created for {created.name}. Give them the initial password in person.</Notice> : null}
        {generalError ? <Notice tone="fault">{generalError.message}</Notice> : null}
        <TextField label="Name" autoComplete="off" error={errors.name?.message} {...register('name')} />
        <TextField label="E-mail" type="email" autoComplete="off" error={errors.email?.message} {...register('email')} />
        <SelectField label="Role" error={errors.role?.message} {...register('role')}>
          {roles.map((role) => (
            <option key={role} value={role}>
              {roleLabels[role]}
            </option>
          ))}
        </SelectField>
        <TextField
          label="Initial password"
          type="text"
          autoComplete="new-password"
          hint="At least 10 characters."
          error={errors.password?.message}
          {...register('password')}
        />
        <Button type="submit" disabled={create.isPending}>
          {create.isPending ? 'Adding…' : 'Add person'}
        </Button>
      </form>
    </Panel>
  );
}
