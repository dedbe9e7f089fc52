import { useMutation, useQueryClient } from '@tanstack/react-query';
import { z } from 'zod';
import { instrumentSchema, type InstrumentInput } from '@shared/schemas/instruments';
import { api } from '@/lib/api-client';
import { instrumentKeys, qualificationListSchema } from './instruments.queries';

const responseSchema = z.object({ instrument: instrumentSchema });

export function useSaveInstrument(id?: number) {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: (input: InstrumentInput) =>
      id === undefined
        ? api('/instruments', { method: 'POST', body: input, schema: responseSchema })
        : api(`/instruments/${id}`, { method: 'PATCH', body: input, schema: responseSchema }),
    onSuccess: ({ instrument }) => {
      queryClient.setQueryData(instrumentKeys.detail(instrument.id), instrument);
      return queryClient.invalidateQueries({ queryKey: instrumentKeys.lists() });
    },
  });
}

export function useGrantQualification(instrumentId: number) {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: (userId: number) =>
      api(`/instruments/${instrumentId}/qualifications`, { method: 'POST', body: { userId }, schema: qualificationListSchema }),
    onSuccess: ({ qualifications }) => queryClient.setQueryData(instrumentKeys.qualifications(instrumentId), qualifications),
  });
}

export function useRevokeQualification(instrumentId: number) {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: (userId: number) => api<void>(`/instruments/${instrumentId}/qualifications/${userId}`, { method: 'DELETE' }),
    onSuccess: () => queryClient.invalidateQueries({ queryKey: instrumentKeys.qualifications(instrumentId) }),
  });
}
