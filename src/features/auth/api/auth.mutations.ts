import { useMutation, useQueryClient, type QueryClient } from '@tanstack/react-query';
import {
  meResponseSchema,
  messageResponseSchema,
  notificationPreferencesSchema,
  type ForgotPasswordInput,
  type SignInInput,
} from '@shared/schemas/auth';
import type { NotificationSettingsInput } from '@shared/schemas/mail';
import type { SessionUser } from '@shared/schemas/people';
import { api, resetCsrfToken } from '@/lib/api-client';
import { authKeys } from './auth.queries';

/** A new session began (sign-in, accepted invitation): fresh CSRF token, and nothing of the previous account stays. */
function startedSession(queryClient: QueryClient, user: SessionUser) {
  resetCsrfToken();
  queryClient.clear();
  queryClient.setQueryData(authKeys.me(), user);
}

export function useSignIn() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: (input: SignInInput) => api('/auth/sign-in', { method: 'POST', body: input, schema: meResponseSchema }),
    onSuccess: ({ user }) => startedSession(queryClient, user),
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

/** Choose a password from an invitation link; the person is signed in. */
export function useAcceptInvitation() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: ({ token, password }: { token: string; password: string }) =>
      api(`/auth/invitation/${encodeURIComponent(token)}`, { method: 'POST', body: { password }, schema: meResponseSchema }),
    onSuccess: ({ user }) => startedSession(queryClient, user),
  });
}

/** Ask for a reset link; the answer is the same whether or not the address has an account. */
export function useRequestPasswordReset() {
  return useMutation({
    mutationFn: (input: ForgotPasswordInput) => api('/auth/forgot-password', { method: 'POST', body: input, schema: messageResponseSchema }),
  });
}

/** Set a new password from a reset link; every session of the person ends, possibly this browser's. */
export function useResetPassword() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: ({ token, password }: { token: string; password: string }) =>
      api(`/auth/reset-password/${encodeURIComponent(token)}`, { method: 'POST', body: { password }, schema: messageResponseSchema }),
    onSuccess: () => {
      resetCsrfToken();
      return queryClient.invalidateQueries({ queryKey: authKeys.me() });
    },
  });
}

export function useUpdateNotificationPreferences() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: (input: NotificationSettingsInput) =>
      api('/auth/me/notifications', { method: 'PUT', body: input, schema: notificationPreferencesSchema }),
    onSuccess: (preferences) => queryClient.setQueryData(authKeys.notifications(), preferences),
  });
}
