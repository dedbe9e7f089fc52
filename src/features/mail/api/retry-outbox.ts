import { useMutation, useQueryClient } from '@tanstack/react-query';
import { z } from 'zod';
import { api } from '@/lib/api-client';
import { mailKeys } from './mail-keys';

const requeuedSchema = z.object({ requeued: z.number().int() });

/** POST /api/outbox/:id/retry: put a failed message back in the queue, due now. */
export function useRetryOutboxEntry() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: (id: number) => api(`/outbox/${id}/retry`, { method: 'POST', body: {}, schema: requeuedSchema }),
    onSuccess: () => queryClient.invalidateQueries({ queryKey: mailKeys.outbox() }),
  });
}
