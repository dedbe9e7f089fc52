import { useMutation, useQueryClient } from '@tanstack/react-query';
import { z } from 'zod';
import type { PartInput } from '@shared/schemas/parts';
import { api } from '@/lib/api-client';
import { partKeys, partResponseSchema } from './parts.queries';

export function useSavePart(id?: number) {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: (input: PartInput) =>
      id === undefined
        ? api('/parts', { method: 'POST', body: input, schema: partResponseSchema })
        : api(`/parts/${id}`, { method: 'PATCH', body: input, schema: partResponseSchema }),
    onSuccess: ({ part }) => {
      queryClient.setQueryData(partKeys.detail(part.id), part);
      return queryClient.invalidateQueries({ queryKey: partKeys.lists() });
    },
  });
}

/** Upload a CSV of parts; the server imports every row or none. */
export function useImportParts() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: (csv: string) => api('/parts/import', { method: 'POST', rawBody: { contentType: 'text/csv', text: csv }, schema: z.object({ imported: z.number() }) }),
    onSuccess: () => queryClient.invalidateQueries({ queryKey: partKeys.lists() }),
  });
}
