import { zodResolver } from '@hookform/resolvers/zod';
import { useState } from 'react';
import { useForm } from 'react-hook-form';
import { roleLabels, roles } from '@shared/domain/roles';
import { createUserInputSchema, type User } from '@shared/schemas/people';
import { Button } from '@/components/ui/button';
import { Notice, Panel } from '@/components/ui/feedback';
import { SelectField, TextField } from '@/components/ui/field';
import { applyServerFieldErrors } from '@/lib/form-errors';
import { useCreatePerson } from '../api/people.mutations';

const formFields = ['email', 'name', 'role', 'password'] as const;

export function AddPersonForm() {
  const create = useCreatePerson();
  const [created, setCreated] = useState<User | null>(null);
  const [banner, setBanner] = useState<string | null>(null);
  const { register, handleSubmit, formState, setError, reset } = useForm({
    resolver: zodResolver(createUserInputSchema),
    defaultValues: { email: '', name: '', role: 'researcher' as const, password: '' },
  });

  const submit = handleSubmit((values) => {
    setCreated(null);
    setBanner(null);
    create.mutate(values, {
      onSuccess: ({ user }) => {
        setCreated(user);
        reset();
      },
      onError: (error) => {
        setBanner(applyServerFieldErrors(error, setError, formFields) ? null : error.message);
      },
    });
  });

  const errors = formState.errors;
  return (
    <Panel title="Add a person">
      <form onSubmit={submit} noValidate className="flex flex-col gap-3" aria-label="Add a person">
        {created ? <Notice tone="pass">Account created for {created.name}. Give them the initial password in person.</Notice> : null}
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
