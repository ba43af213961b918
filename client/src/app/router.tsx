import { createBrowserRouter } from 'react-router-dom';
import { authKeys } from '@/features/auth/api/keys';
import { setUnauthorizedHandler } from '@/lib/api-client';
import { queryClient } from '@/lib/query-client';
import { isPublicPath, signInPath } from '@/lib/return-to';
import * as home from './routes/home';
import * as protectedLayout from './routes/protected-layout';
import * as signIn from './routes/auth/sign-in';
import * as forgot from './routes/auth/forgot-password';
import * as reset from './routes/auth/reset-password';
import * as accept from './routes/auth/accept-invitation';
import * as jobsList from './routes/jobs/list';
import * as jobsNew from './routes/jobs/new';
import * as jobDetail from './routes/jobs/detail';
import * as aircraftList from './routes/aircraft/list';
import * as aircraftNew from './routes/aircraft/new';
import * as aircraftDetail from './routes/aircraft/detail';
import * as aircraftEdit from './routes/aircraft/edit';
import * as ownersList from './routes/owners/list';
import * as ownersNew from './routes/owners/new';
import * as ownerDetail from './routes/owners/detail';
import * as ownerEdit from './routes/owners/edit';
import * as staff from './routes/staff';
import * as settings from './routes/settings';
import * as myAircraft from './routes/my-aircraft';
import * as notFound from './routes/not-found';
import { RouteError } from './routes/route-error';

export function createRouter() {
  const router = createBrowserRouter([
    { path: '/', ...home, errorElement: <RouteError /> },
    { path: '/sign-in', ...signIn, errorElement: <RouteError /> },
    { path: '/forgot-password', ...forgot },
    { path: '/reset-password', ...reset },
    { path: '/accept-invitation', ...accept },
    {
      ...protectedLayout,
      errorElement: <RouteError />,
      children: [
        {
          errorElement: <RouteError />,
          children: [
            { path: '/jobs', ...jobsList },
            { path: '/jobs/new', ...jobsNew },
            { path: '/jobs/:id', ...jobDetail },
            { path: '/aircraft', ...aircraftList },
            { path: '/aircraft/new', ...aircraftNew },
            { path: '/aircraft/:id', ...aircraftDetail },
            { path: '/aircraft/:id/edit', ...aircraftEdit },
            { path: '/owners', ...ownersList },
            { path: '/owners/new', ...ownersNew },
            { path: '/owners/:id', ...ownerDetail },
            { path: '/owners/:id/edit', ...ownerEdit },
            { path: '/staff', ...staff },
            { path: '/settings', ...settings },
            { path: '/my-aircraft', ...myAircraft },
          ],
        },
      ],
    },
    { path: '*', ...notFound },
  ]);

  // A session that ends mid-visit (expired, signed out elsewhere) sends the person to sign in and
  // brings them back to the same page afterwards.
  setUnauthorizedHandler(() => {
    const { pathname, search } = window.location;
    if (isPublicPath(pathname)) return;
    queryClient.clear();
    queryClient.setQueryData(authKeys.session(), null);
    void router.navigate(signInPath(pathname + search), { replace: true });
  });

  return router;
}
