import { createBrowserRouter, redirect, RouterProvider, type LoaderFunctionArgs, type ShouldRevalidateFunction } from 'react-router-dom';
import { hasRole, type Role } from '@shared/domain/roles';
import { meOptions } from '@/features/auth/api/auth.queries';
import { AppShell } from './routes/app-shell';
import { RouteError } from './routes/route-error';
import { queryClient } from './query';

/** The signed-in user; without one, off to the sign-in page, remembering where the user was going. */
async function signedInUser(request: Request) {
  const user = await queryClient.ensureQueryData(meOptions());
  if (!user) {
    const url = new URL(request.url);
    throw redirect(`/sign-in?next=${encodeURIComponent(url.pathname + url.search)}`);
  }
  return user;
}

async function requireSignedIn({ request }: LoaderFunctionArgs) {
  await signedInUser(request);
  return null;
}

function requireRoleLoader(minimum: Role, message: string) {
  return async ({ request }: LoaderFunctionArgs) => {
    const user = await signedInUser(request);
    if (!hasRole(user.role, minimum)) throw new Response(message, { status: 403 });
    return null;
  };
}

/**
 * Auth loaders only need to run when the page changes, not when its search params (filters, selections) do:
 * re-running them makes every filter change an asynchronous navigation, and quick successive changes race.
 */
const onlyOnNewPage: ShouldRevalidateFunction = ({ currentUrl, nextUrl, defaultShouldRevalidate }) =>
  currentUrl.pathname !== nextUrl.pathname ? defaultShouldRevalidate : false;

const router = createBrowserRouter([
  {
    path: '/sign-in',
    lazy: async () => ({ Component: (await import('./routes/sign-in')).SignInRoute }),
    errorElement: <RouteError />,
  },
  // Reached from e-mailed links and from the sign-in page, signed out.
  {
    path: '/invitation/:token',
    lazy: async () => ({ Component: (await import('./routes/invitation')).InvitationRoute }),
    errorElement: <RouteError />,
  },
  {
    path: '/forgot-password',
    lazy: async () => ({ Component: (await import('./routes/forgot-password')).ForgotPasswordRoute }),
    errorElement: <RouteError />,
  },
  {
    path: '/reset-password/:token',
    lazy: async () => ({ Component: (await import('./routes/reset-password')).ResetPasswordRoute }),
    errorElement: <RouteError />,
  },
  {
    path: '/',
    element: <AppShell />,
    loader: requireSignedIn,
    shouldRevalidate: onlyOnNewPage,
    errorElement: <RouteError />,
    children: [
      {
        errorElement: <RouteError />,
        children: [
          { index: true, lazy: async () => ({ Component: (await import('./routes/overview')).OverviewRoute }) },
          { path: 'account', lazy: async () => ({ Component: (await import('./routes/account')).AccountRoute }) },
          { path: 'calendar', lazy: async () => ({ Component: (await import('./routes/calendar')).CalendarRoute }) },
          {
            path: 'bookings',
            loader: requireRoleLoader('researcher', 'My bookings is for researchers and lab managers.'),
            shouldRevalidate: onlyOnNewPage,
            lazy: async () => ({ Component: (await import('./routes/my-bookings')).MyBookingsRoute }),
          },
          { path: 'bookings/:id', lazy: async () => ({ Component: (await import('./routes/booking-detail')).BookingDetailRoute }) },
          {
            // The link of a freed-slot e-mail: opening it books the slot.
            path: 'waitlist/:id/claim',
            loader: requireRoleLoader('researcher', 'Waitlist offers are for researchers and lab managers.'),
            shouldRevalidate: onlyOnNewPage,
            lazy: async () => ({ Component: (await import('./routes/waitlist-claim')).WaitlistClaimRoute }),
          },
          { path: 'setups', lazy: async () => ({ Component: (await import('./routes/setups')).SetupsRoute }) },
          {
            path: 'setups/new',
            loader: requireRoleLoader('researcher', 'Recording setups is for researchers and lab managers.'),
            shouldRevalidate: onlyOnNewPage,
            lazy: async () => ({ Component: (await import('./routes/setup-new')).SetupNewRoute }),
          },
          { path: 'setups/:id', lazy: async () => ({ Component: (await import('./routes/setup-detail')).SetupDetailRoute }) },
          {
            path: 'setups/:id/edit',
            loader: requireRoleLoader('researcher', 'Editing setups is for researchers and lab managers.'),
            shouldRevalidate: onlyOnNewPage,
            lazy: async () => ({ Component: (await import('./routes/setup-edit')).SetupEditRoute }),
          },
          { path: 'setups/:id/rebuild', lazy: async () => ({ Component: (await import('./routes/setup-rebuild')).SetupRebuildRoute }) },
          { path: 'instruments', lazy: async () => ({ Component: (await import('./routes/instruments')).InstrumentsRoute }) },
          {
            path: 'instruments/new',
            loader: requireRoleLoader('manager', 'Only lab managers add instruments.'),
            shouldRevalidate: onlyOnNewPage,
            lazy: async () => ({ Component: (await import('./routes/instrument-edit')).InstrumentEditRoute }),
          },
          { path: 'instruments/:id', lazy: async () => ({ Component: (await import('./routes/instrument-detail')).InstrumentDetailRoute }) },
          {
            path: 'instruments/:id/edit',
            loader: requireRoleLoader('manager', 'Only lab managers edit instruments.'),
            shouldRevalidate: onlyOnNewPage,
            lazy: async () => ({ Component: (await import('./routes/instrument-edit')).InstrumentEditRoute }),
          },
          { path: 'parts', lazy: async () => ({ Component: (await import('./routes/parts')).PartsRoute }) },
          {
            path: 'parts/new',
            loader: requireRoleLoader('manager', 'Only lab managers add parts.'),
            shouldRevalidate: onlyOnNewPage,
            lazy: async () => ({ Component: (await import('./routes/part-edit')).PartEditRoute }),
          },
          { path: 'parts/:id', lazy: async () => ({ Component: (await import('./routes/part-detail')).PartDetailRoute }) },
          {
            path: 'parts/:id/edit',
            loader: requireRoleLoader('manager', 'Only lab managers edit parts.'),
            shouldRevalidate: onlyOnNewPage,
            lazy: async () => ({ Component: (await import('./routes/part-edit')).PartEditRoute }),
          },
          {
            path: 'labels',
            loader: requireRoleLoader('manager', 'Only lab managers print labels.'),
            shouldRevalidate: onlyOnNewPage,
            lazy: async () => ({ Component: (await import('./routes/labels')).LabelsRoute }),
          },
          {
            path: 'people',
            loader: requireRoleLoader('manager', 'The People page is for lab managers.'),
            shouldRevalidate: onlyOnNewPage,
            lazy: async () => ({ Component: (await import('./routes/people')).PeopleRoute }),
          },
          {
            path: 'mail',
            loader: requireRoleLoader('manager', 'The Mail page is for lab managers: it shows every message Skewbench sends.'),
            shouldRevalidate: onlyOnNewPage,
            lazy: async () => ({ Component: (await import('./routes/mail')).MailRoute }),
          },
          { path: '*', lazy: async () => ({ Component: (await import('./routes/not-found')).NotFoundRoute }) },
        ],
      },
    ],
  },
]);

export function AppRouter() {
  return <RouterProvider router={router} />;
}
