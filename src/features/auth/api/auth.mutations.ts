import { useMutation, useQueryClient } from '@tanstack/react-query';
import { meResponseSchema, type SignInInput } from '@shared/schemas/auth';
import { api, resetCsrfToken } from '@/lib/api-client';
import { authKeys } from './auth.queries';

export function useSignIn() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: (input: SignInInput) => api('/auth/sign-in', { method: 'POST', body: input, schema: meResponseSchema }),
    onSuccess: ({ user }) => {
      resetCsrfToken();
      // Whatever the previous account could see must not linger in the cache.
      queryClient.clear();
      queryClient.setQueryData(authKeys.me(), user);
    },
  });
}

export function useSignOut() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: () => api<void>('/auth/sign-out', { method: 'POST' }),
    onSettled: () => {
      resetCsrfToken();
      queryClient.clear();
      queryClient.setQueryData(authKeys.me(), null);
    },
  });
}
