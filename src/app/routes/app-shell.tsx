import { useQuery } from '@tanstack/react-query';
import { Navigate, NavLink, Outlet, useLocation, useNavigate, useNavigation } from 'react-router-dom';
import { hasRole, roleLabels, type Role } from '@shared/domain/roles';
import { Button } from '@/components/ui/button';
import { Loading } from '@/components/ui/feedback';
import { useSignOut } from '@/features/auth/api/auth.mutations';
import { meOptions } from '@/features/auth/api/auth.queries';
import { labInfoOptions } from '@/features/lab/api/lab.queries';

/** Navigation entries and the least role that sees each. */
const navigation: { to: string; label: string; minimum: Role }[] = [
  { to: '/', label: 'Overview', minimum: 'visitor' },
  { to: '/calendar', label: 'Calendar', minimum: 'visitor' },
  { to: '/bookings', label: 'My bookings', minimum: 'researcher' },
  { to: '/setups', label: 'Setups', minimum: 'visitor' },
  { to: '/instruments', label: 'Instruments', minimum: 'visitor' },
  { to: '/parts', label: 'Cables & parts', minimum: 'visitor' },
  { to: '/labels', label: 'Labels', minimum: 'manager' },
  { to: '/people', label: 'People', minimum: 'manager' },
  { to: '/mail', label: 'Mail', minimum: 'manager' },
];

export function AppShell() {
  const me = useQuery(meOptions());
  const lab = useQuery(labInfoOptions());
  const signOut = useSignOut();
  const navigate = useNavigate();
  const location = useLocation();
  const busy = useNavigation().state === 'loading';

  if (me.isPending) return <Loading label="Checking your session…" />;
  if (!me.data) {
    const next = location.pathname === '/' ? '' : `?next=${encodeURIComponent(location.pathname + location.search)}`;
    return <Navigate to={`/sign-in${next}`} replace />;
  }
  const user = me.data;

  return (
    <div className="min-h-screen">
      <a href="#main" className="sr-only focus:not-sr-only focus:absolute focus:left-3 focus:top-3 focus:rounded-chip focus:bg-white focus:px-3 focus:py-2">
        Skip to content
      </a>
      <header className="bg-ink-900 text-ptfe-50 print:hidden">
        <div className="mx-auto flex max-w-7xl flex-wrap items-center gap-x-5 gap-y-2 px-5 py-3">
          <div className="flex items-baseline gap-3">
            <span className="text-lead font-extrabold tracking-tight">
              skew<span className="text-copper-300">bench</span>
            </span>
            {lab.data ? <span className="hidden text-caption text-ink-300 2xl:inline">{lab.data.name}</span> : null}
          </div>
          <nav aria-label="Main" className="flex flex-1 flex-wrap gap-1">
            {navigation
              .filter((item) => hasRole(user.role, item.minimum))
              .map((item) => (
                <NavLink
                  key={item.to}
                  to={item.to}
                  end={item.to === '/'}
                  className={({ isActive }) =>
                    `whitespace-nowrap rounded-chip px-2.5 py-1.5 text-body font-semibold ${isActive ? 'bg-ink-700 text-white' : 'text-ink-200 hover:bg-ink-800 hover:text-white'}`
                  }
                >
                  {item.label}
                </NavLink>
              ))}
          </nav>
          <div className="flex items-center gap-3">
            <NavLink
              to="/account"
              title="Your account and e-mail notifications"
              className={({ isActive }) => `rounded-chip px-2 py-1 text-right leading-tight hover:bg-ink-800 ${isActive ? 'bg-ink-700' : ''}`}
            >
              <div className="whitespace-nowrap text-body font-semibold">{user.name}</div>
              <div className="text-caption text-copper-200" data-testid="role-label">
                {roleLabels[user.role]}
              </div>
            </NavLink>
            <Button
              variant="secondary"
              className="!py-1.5"
              disabled={signOut.isPending}
              onClick={() => signOut.mutate(undefined, { onSettled: () => navigate('/sign-in', { replace: true }) })}
            >
              Sign out
            </Button>
          </div>
        </div>
        <div className={`h-0.5 bg-copper-400 transition-opacity ${busy ? 'animate-pulse opacity-100' : 'opacity-0'}`} aria-hidden />
      </header>
      <main id="main" className="mx-auto max-w-7xl px-5 py-8 print:max-w-none print:p-0">
        <Outlet />
      </main>
    </div>
  );
}
