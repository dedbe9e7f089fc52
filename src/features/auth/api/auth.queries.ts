import { queryOptions } from '@tanstack/react-query';
import { meResponseSchema } from '@shared/schemas/auth';
import type { SessionUser } from '@shared/schemas/people';
import { api, ApiError } from '@/lib/api-client';

export const authKeys = {
  all: ['auth'] as const,
  me: () => [...authKeys.all, 'me'] as const,
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
