import { createBrowserRouter, redirect, type LoaderFunctionArgs } from 'react-router-dom';
import { getMe, meQueryOptions } from '../features/auth/api/get-me';
import { plantQueryOptions } from '../features/floor/api/get-plant';
import { tankQueryOptions } from '../features/tanks/api/get-tank';
import { Loading } from '../components/ui/page-state';
import { queryClient } from '../lib/query-client';
import { ChangePasswordRoute } from './routes/change-password';
import { FloorRoute } from './routes/floor';
import { NotFoundRoute } from './routes/not-found';
import { RouteError } from './routes/route-error';
import { SignInRoute } from './routes/sign-in';
import { SCREENS } from './screens';
import { installSessionHandlers } from './session';
import { AppShell } from './shell/app-shell';

async function requireUser({ request }: LoaderFunctionArgs) {
  const user = await queryClient.ensureQueryData(meQueryOptions());
  if (!user) {
    const url = new URL(request.url);
    const next = url.pathname + url.search;
    throw redirect(next === '/' ? '/sign-in' : `/sign-in?next=${encodeURIComponent(next)}`);
  }
  // Start loading the plant while the shell renders.
  void queryClient.prefetchQuery(plantQueryOptions());
  return null;
}

/**
 * Already signed in: straight to the Floor. Asks the server, never a cached user, and leaves
 * the cache alone: the shell of an ending session is still mounted while this runs.
 */
async function skipSignInWhenSignedIn() {
  try {
    const user = await getMe();
    if (user) return redirect('/');
  } catch {
    // Server unreachable: show the form; signing in will report the problem.
  }
  return null;
}

export const router = createBrowserRouter([
  {
    path: '/first-run',
    lazy: async () => ({ Component: (await import('./routes/first-run')).FirstRunRoute }),
    errorElement: <RouteError />,
    hydrateFallbackElement: <Loading />,
  },
  {
    path: '/sign-in',
    loader: skipSignInWhenSignedIn,
    element: <SignInRoute />,
    errorElement: <RouteError />,
    hydrateFallbackElement: <Loading />,
  },
  {
    path: '/',
    loader: requireUser,
    element: <AppShell />,
    errorElement: <RouteError />,
    hydrateFallbackElement: <Loading label="Checking your session…" />,
    children: [
      {
        // A failing screen keeps the header, the clock and the connection state.
        errorElement: <RouteError />,
        children: [
          { index: true, element: <FloorRoute /> },
          { path: 'sites/:tag', element: <FloorRoute /> },
          {
            path: 'tanks/:id',
            loader: ({ params }) => {
              const id = Number(params.id);
              if (Number.isInteger(id) && id > 0) void queryClient.prefetchQuery(tankQueryOptions(id));
              return null;
            },
            lazy: async () => ({ Component: (await import('./routes/tank')).TankRoute }),
          },
          { path: SCREENS.setup.path.slice(1), lazy: async () => ({ Component: (await import('./routes/plant-setup')).PlantSetupRoute }) },
          { path: 'account/password', element: <ChangePasswordRoute /> },
          { path: SCREENS.alarms.path.slice(1), lazy: async () => ({ Component: (await import('./routes/alarm-desk')).AlarmDeskRoute }) },
          { path: SCREENS.bands.path.slice(1), lazy: async () => ({ Component: (await import('./routes/bands')).BandsRoute }) },
          { path: SCREENS.assays.path.slice(1), lazy: async () => ({ Component: (await import('./routes/assays')).AssaysRoute }) },
          { path: SCREENS.calibration.path.slice(1), lazy: async () => ({ Component: (await import('./routes/calibration')).CalibrationRoute }) },
          { path: SCREENS.dose.path.slice(1), lazy: async () => ({ Component: (await import('./routes/dose-advisor')).DoseAdvisorRoute }) },
          { path: SCREENS.roster.path.slice(1), lazy: async () => ({ Component: (await import('./routes/call-roster')).CallRosterRoute }) },
          { path: SCREENS.digest.path.slice(1), lazy: async () => ({ Component: (await import('./routes/shift-digest')).ShiftDigestRoute }) },
          { path: SCREENS.shiftLog.path.slice(1), lazy: async () => ({ Component: (await import('./routes/shift-log')).ShiftLogRoute }) },
          // Readings in and out: linked from the Shift log and the Shift digest rather than the crowded nav.
          { path: 'readings', lazy: async () => ({ Component: (await import('./routes/readings')).ReadingsRoute }) },
          { path: '*', element: <NotFoundRoute /> },
        ],
      },
    ],
  },
]);

installSessionHandlers((to, opts) => router.navigate(to, opts));
