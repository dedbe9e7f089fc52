import { useMutation, useQueryClient } from '@tanstack/react-query';
import { userResponseSchema, type CreateUserInput, type UpdateUserInput } from '@shared/schemas/people';
import { api } from '@/lib/api-client';
import { peopleKeys } from './people.queries';

export function useCreatePerson() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: (input: CreateUserInput) => api('/users', { method: 'POST', body: input, schema: userResponseSchema }),
    onSuccess: () => queryClient.invalidateQueries({ queryKey: peopleKeys.lists() }),
  });
}

export function useUpdatePerson() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: ({ id, changes }: { id: number; changes: UpdateUserInput }) =>
      api(`/users/${id}`, { method: 'PATCH', body: changes, schema: userResponseSchema }),
    onSuccess: () => queryClient.invalidateQueries({ queryKey: peopleKeys.lists() }),
  });
}
