import { useQuery } from '@tanstack/react-query';
import { hasRole, type Role } from '@shared/domain/roles';
import type { SessionUser } from '@shared/schemas/people';
import { meOptions } from '../api/auth.queries';

/** The signed-in user on pages under the app shell (which only renders once the user is known). */
export function useSignedInUser(): SessionUser & { can: (minimum: Role) => boolean } {
  const { data } = useQuery(meOptions());
  if (!data) throw new Error('useSignedInUser is used outside the signed-in app shell');
  return { ...data, can: (minimum: Role) => hasRole(data.role, minimum) };
}
