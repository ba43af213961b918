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
import * as notFound from './routes/not-found';
import { RouteError } from './routes/route-error';

// Staff and owner pages load on first visit, so a phone opening an e-mailed link downloads only
// what that page needs.
export function createRouter() {
  const router = createBrowserRouter([
    { path: '/', ...home, errorElement: <RouteError /> },
    { path: '/sign-in', ...signIn, errorElement: <RouteError /> },
    { path: '/forgot-password', ...forgot },
    { path: '/reset-password', ...reset },
    { path: '/accept-invitation', ...accept },
    // The owner's e-mailed link: public, and loaded on its own so a phone fetches only this page.
    { path: '/decide/:token', lazy: () => import('./routes/decide'), errorElement: <RouteError /> },
    {
      ...protectedLayout,
      errorElement: <RouteError />,
      children: [
        {
          errorElement: <RouteError />,
          children: [
            { path: '/jobs', lazy: () => import('./routes/jobs/list') },
            { path: '/jobs/new', lazy: () => import('./routes/jobs/new') },
            { path: '/jobs/:id', lazy: () => import('./routes/jobs/detail') },
            { path: '/aircraft', lazy: () => import('./routes/aircraft/list') },
            { path: '/aircraft/new', lazy: () => import('./routes/aircraft/new') },
            { path: '/aircraft/:id', lazy: () => import('./routes/aircraft/detail') },
            { path: '/aircraft/:id/edit', lazy: () => import('./routes/aircraft/edit') },
            { path: '/owners', lazy: () => import('./routes/owners/list') },
            { path: '/owners/new', lazy: () => import('./routes/owners/new') },
            { path: '/owners/:id', lazy: () => import('./routes/owners/detail') },
            { path: '/owners/:id/edit', lazy: () => import('./routes/owners/edit') },
            { path: '/staff', lazy: () => import('./routes/staff') },
            { path: '/settings', lazy: () => import('./routes/settings') },
            { path: '/my-aircraft', lazy: () => import('./routes/my-aircraft') },
            { path: '/my-aircraft/payment', lazy: () => import('./routes/my-aircraft-payment') },
            { path: '/deposits', lazy: () => import('./routes/deposits') },
            { path: '/accounts/deposits', lazy: () => import('./routes/accounts/deposits') },
            { path: '/catalogue', lazy: () => import('./routes/catalogue') },
            { path: '/templates', lazy: () => import('./routes/templates/list') },
            { path: '/templates/new', lazy: () => import('./routes/templates/edit') },
            { path: '/templates/:id', lazy: () => import('./routes/templates/edit') },
            { path: '/hangar', lazy: () => import('./routes/hangar/list') },
            { path: '/hangar/:id', lazy: () => import('./routes/hangar/job') },
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
