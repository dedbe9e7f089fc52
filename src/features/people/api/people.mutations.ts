import { useMutation, useQueryClient } from '@tanstack/react-query';
import { invitationResponseSchema, userResponseSchema, type CreateUserInput, type InviteUserInput, type UpdateUserInput } from '@shared/schemas/people';
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

/** Invite by e-mail; for a pending invitee this sends a new link and the older ones stop working. */
export function useInvitePerson() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: (input: InviteUserInput) => api('/users/invitations', { method: 'POST', body: input, schema: invitationResponseSchema }),
    onSuccess: () => queryClient.invalidateQueries({ queryKey: peopleKeys.lists() }),
  });
}
