import { QueryClientProvider } from '@tanstack/react-query';
import type { ReactNode } from 'react';
import { authKeys } from '@/features/auth/api/auth.queries';
import { queryClient } from './query';
import { setSignedOutHandler } from '@/lib/query-client';

// A 401 anywhere means the session ended (signed out elsewhere, deactivated, expired): forget the user,
// and the protected layout sends the browser to the sign-in page.
setSignedOutHandler(() => queryClient.setQueryData(authKeys.me(), null));

export function AppProvider({ children }: { children: ReactNode }) {
  return <QueryClientProvider client={queryClient}>{children}</QueryClientProvider>;
}
