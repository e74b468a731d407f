// Every screen of the web app, each loaded on first visit. The signed-in part sits under one layout
// whose loader asks who is signed in; a 401 from any later request sends the person back to sign in.
import { useQueryClient, type QueryClient } from '@tanstack/react-query';
import { useEffect, useMemo, type ComponentType } from 'react';
import { createBrowserRouter, redirect, RouterProvider } from 'react-router-dom';
import { LoadingState } from '@/components/ui/states';
import { paths } from '@/config/paths';
import { setUnauthenticatedHandler } from '@/lib/api-client';
import { homeFor, meQuery, requireUser, returnPath } from '@/lib/auth';
import { pageTitle } from './page-title';

type RouteModule = { default: ComponentType };
const page = (load: () => Promise<RouteModule>) => async () => ({ Component: (await load()).default });

const opening = <LoadingState label="Opening Beadroll…" />;

export function createRouter(queryClient: QueryClient) {
  return createBrowserRouter([
    {
      path: paths.signIn.path,
      hydrateFallbackElement: opening,
      loader: async () => {
        const me = await queryClient.ensureQueryData(meQuery).catch(() => null);
        return me ? redirect(homeFor(me)) : null;
      },
      lazy: page(() => import('./routes/auth/sign-in')),
    },
    { path: paths.setPassword.path, hydrateFallbackElement: opening, lazy: page(() => import('./routes/auth/set-password')) },
    { path: paths.forgotPassword.path, hydrateFallbackElement: opening, lazy: page(() => import('./routes/auth/forgot-password')) },
    { path: paths.devMail.path, lazy: page(() => import('./routes/dev/mail')) },
    { path: paths.devMailMessage.path, lazy: page(() => import('./routes/dev/mail-message')) },
    // The public Verify page: no sign-in and no shell, reached from the QR code on a wallet card.
    { path: paths.verify.path, hydrateFallbackElement: opening, lazy: page(() => import('./routes/public/verify')) },
    { path: paths.apiReference.path, hydrateFallbackElement: opening, lazy: page(() => import('./routes/public/api-reference')) },
    {
      id: 'app',
      path: '/',
      hydrateFallbackElement: opening,
      loader: ({ request }) => requireUser(queryClient, request),
      lazy: async () => {
        const module = await import('./routes/app/root');
        return { Component: module.default, ErrorBoundary: module.RootErrorBoundary };
      },
      children: [
        {
          // Errors of one screen show inside the shell, so the navigation stays usable.
          lazy: async () => ({ ErrorBoundary: (await import('./routes/app/route-error')).default }),
          children: [
        {
          index: true,
          loader: async () => {
            const me = await queryClient.ensureQueryData(meQuery);
            return me?.role === 'welder' ? redirect(paths.myQualifications.href()) : null;
          },
          lazy: page(() => import('./routes/app/overview')),
        },
        { path: paths.myQualifications.path, lazy: page(() => import('./routes/app/my-qualifications')) },
        { path: paths.welders.path, lazy: page(() => import('./routes/app/welders')) },
        { path: paths.welder.path, lazy: page(() => import('./routes/app/welder')) },
        { path: paths.shops.path, lazy: page(() => import('./routes/app/shops')) },
        { path: paths.people.path, lazy: page(() => import('./routes/app/people')) },
        { path: paths.audit.path, lazy: page(() => import('./routes/app/audit')) },
        { path: paths.procedures.path, lazy: page(() => import('./routes/app/procedures')) },
        { path: paths.coupons.path, lazy: page(() => import('./routes/app/coupons')) },
        { path: paths.couponNew.path, lazy: page(() => import('./routes/app/coupon-new')) },
        { path: paths.coupon.path, lazy: page(() => import('./routes/app/coupon')) },
        { path: paths.continuity.path, lazy: page(() => import('./routes/app/continuity')) },
        { path: paths.welds.path, lazy: page(() => import('./routes/app/welds')) },
        { path: paths.weld.path, lazy: page(() => import('./routes/app/weld')) },
        { path: paths.crewFinder.path, lazy: page(() => import('./routes/app/crew-finder')) },
        { path: paths.lapseWatch.path, lazy: page(() => import('./routes/app/lapse-watch')) },
        { path: paths.settings.path, lazy: page(() => import('./routes/app/settings')) },
        { path: paths.imports.path, lazy: page(() => import('./routes/app/imports')) },
        { path: paths.apiTokens.path, lazy: page(() => import('./routes/app/api-tokens')) },
        { path: paths.reports.path, lazy: page(() => import('./routes/app/reports')) },
        { path: paths.account.path, lazy: page(() => import('./routes/app/account')) },
        { path: '*', lazy: page(() => import('./routes/app/not-found')) },
          ],
        },
      ],
    },
  ]);
}

export function AppRouter() {
  const queryClient = useQueryClient();
  const router = useMemo(() => createRouter(queryClient), [queryClient]);

  useEffect(() => {
    setUnauthenticatedHandler(() => {
      const here = new URL(window.location.href);
      if (here.pathname === paths.signIn.path) return;
      queryClient.setQueryData(meQuery.queryKey, null);
      void router.navigate(paths.signIn.href(returnPath(here)), { replace: true });
    });
    return () => setUnauthenticatedHandler(null);
  }, [queryClient, router]);

  useEffect(() => {
    const name = () => {
      document.title = pageTitle(router.state.location.pathname);
    };
    name();
    return router.subscribe(name);
  }, [router]);

  return <RouterProvider router={router} />;
}
