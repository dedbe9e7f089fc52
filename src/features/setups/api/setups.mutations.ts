import { useMutation, useQueryClient } from '@tanstack/react-query';
import type { SetupDocumentInput } from '@shared/schemas/setups';
import { api } from '@/lib/api-client';
import { setupKeys, setupResponseSchema } from './setups.queries';

/** Record a first setup for a booking (its owner or a manager). */
export function useCreateSetup() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: (input: { bookingId: number; document: SetupDocumentInput; note: string }) =>
      api('/setups', { method: 'POST', body: input, schema: setupResponseSchema }),
    onSuccess: () => queryClient.invalidateQueries({ queryKey: setupKeys.lists() }),
  });
}

/** Save the editor's document as a new revision; earlier revisions stay as they were. */
export function useSaveRevision(id: number) {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: (input: { document: SetupDocumentInput; note: string }) => api(`/setups/${id}`, { method: 'PUT', body: input, schema: setupResponseSchema }),
    onSuccess: () => Promise.all([queryClient.invalidateQueries({ queryKey: setupKeys.detail(id) }), queryClient.invalidateQueries({ queryKey: setupKeys.lists() })]),
  });
}

/** Start a new setup for another booking from a revision of this one. */
export function useReloadSetup(id: number) {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: (input: { bookingId: number; revision?: number }) => api(`/setups/${id}/reload`, { method: 'POST', body: input, schema: setupResponseSchema }),
    onSuccess: () => queryClient.invalidateQueries({ queryKey: setupKeys.lists() }),
  });
}
