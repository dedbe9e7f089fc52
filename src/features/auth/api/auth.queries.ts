import { queryOptions } from '@tanstack/react-query';
import { invitationInfoSchema, meResponseSchema, notificationPreferencesSchema, resetLinkInfoSchema } from '@shared/schemas/auth';
import type { SessionUser } from '@shared/schemas/people';
import { api, ApiError } from '@/lib/api-client';

export const authKeys = {
  all: ['auth'] as const,
  me: () => [...authKeys.all, 'me'] as const,
  notifications: () => [...authKeys.me(), 'notifications'] as const,
  links: () => [...authKeys.all, 'link'] as const,
  invitation: (token: string) => [...authKeys.links(), 'invitation', token] as const,
  resetLink: (token: string) => [...authKeys.links(), 'reset', token] as const,
};

/** The signed-in user, or null when signed out (a 401 is an answer here, not a failure). */
async function getMe(): Promise<SessionUser | null> {
  try {
    return (await api('/auth/me', { schema: meResponseSchema })).user;
  } catch (err) {
    if (err instanceof ApiError && err.status === 401) return null;
    throw err;
  }
}

export const meOptions = () => queryOptions({ queryKey: authKeys.me(), queryFn: getMe, staleTime: 60_000 });

/** The signed-in person's notification choices. */
export const notificationPreferencesOptions = () =>
  queryOptions({ queryKey: authKeys.notifications(), queryFn: () => api('/auth/me/notifications', { schema: notificationPreferencesSchema }) });

const token = (value: string) => encodeURIComponent(value);

/** Who an invitation link is for; fails with `token_invalid` once it no longer works. */
export const invitationOptions = (value: string) =>
  queryOptions({
    queryKey: authKeys.invitation(value),
    queryFn: () => api(`/auth/invitation/${token(value)}`, { schema: invitationInfoSchema }),
    staleTime: Infinity,
    refetchOnWindowFocus: false,
  });

/** The account a reset link is for; fails with `token_invalid` once it no longer works. */
export const resetLinkOptions = (value: string) =>
  queryOptions({
    queryKey: authKeys.resetLink(value),
    queryFn: () => api(`/auth/reset-password/${token(value)}`, { schema: resetLinkInfoSchema }),
    staleTime: Infinity,
    refetchOnWindowFocus: false,
  });
