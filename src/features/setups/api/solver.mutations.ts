import { useMutation } from '@tanstack/react-query';
import { solverAnswerSchema, type SolverInput } from '@shared/schemas/solver';
import { api } from '@/lib/api-client';

/**
 * Ask the server which free parts emulate the angles wanted (POST /api/solver). A mutation, as the search runs on
 * an explicit click and its answer belongs to that click; it changes nothing, so nothing is invalidated.
 */
export function useSolveCables() {
  return useMutation({
    mutationFn: (input: SolverInput) => api('/solver', { method: 'POST', body: input, schema: solverAnswerSchema }),
  });
}
