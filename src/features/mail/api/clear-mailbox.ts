import { useMutation, useQueryClient } from '@tanstack/react-query';
import { z } from 'zod';
import { api } from '@/lib/api-client';
import { mailKeys } from './mail-keys';

const clearedSchema = z.object({ deleted: z.number().int() });

/** DELETE /api/mailbox: forget every captured message (the outbox keeps its record of what was sent). */
export function useClearMailbox() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: () => api('/mailbox', { method: 'DELETE', schema: clearedSchema }),
    onSuccess: () => {
      // The messages are gone: drop their cached details rather than refetch them into 404s.
      queryClient.removeQueries({ queryKey: mailKeys.details() });
      return queryClient.invalidateQueries({ queryKey: mailKeys.lists() });
    },
  });
}
