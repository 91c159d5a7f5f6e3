// The route tree. Pages load lazily, one module per route under ./routes. Access is decided here
// by wrapping routes in guards: RequireSession (signed in, app frame) and RequireRole (policy).
//
// To add a page: add its path to config/paths.ts, create ./routes/<area>/<page>.tsx with a default
// export (and optionally `clientLoader` to prefetch with the QueryClient), list it below under the
// guard of its policy, and add a navigation item in components/layouts/navigation.ts if it needs one.
import { useMemo, type ComponentType } from 'react';
import { createBrowserRouter, RouterProvider, type LoaderFunction, type RouteObject } from 'react-router-dom';
import { useQueryClient, type QueryClient } from '@tanstack/react-query';
import { RouteErrorPage } from '../components/errors/route-error.tsx';
import { PageLoading } from '../components/ui/page-loading.tsx';
import { paths } from '../config/paths.ts';
import { RedirectToRoleHome, RequireRole, RequireSession } from './guards.tsx';

/** What a route module under ./routes may export. */
export type RouteModule = {
  default: ComponentType;
  /** Builds the route's loader, e.g. `(queryClient) => () => queryClient.ensureQueryData(...)`. */
  clientLoader?: (queryClient: QueryClient) => LoaderFunction;
};

export function createAppRoutes(queryClient: QueryClient): RouteObject[] {
  const page = (load: () => Promise<RouteModule>) => async () => {
    const module = await load();
    return module.clientLoader
      ? { Component: module.default, loader: module.clientLoader(queryClient) }
      : { Component: module.default };
  };

  return [
    {
      id: 'root',
      errorElement: <RouteErrorPage />,
      hydrateFallbackElement: <PageLoading />,
      children: [
        { path: paths.auth.signIn.path, lazy: page(() => import('./routes/sign-in.tsx')) },
        {
          path: paths.auth.acceptInvitation.path,
          lazy: page(() => import('./routes/accept-invitation.tsx')),
        },
        {
          element: <RequireSession />,
          children: [
            { path: paths.home.path, element: <RedirectToRoleHome /> },
            {
              element: <RequireRole policy="lab" />,
              children: [
                { path: paths.lab.overview.path, lazy: page(() => import('./routes/lab/overview.tsx')) },
                { path: paths.lab.uploads.path, lazy: page(() => import('./routes/lab/uploads.tsx')) },
                { path: paths.lab.peerReport.path, lazy: page(() => import('./routes/lab/peer-report.tsx')) },
                { path: paths.lab.reportRow.path, lazy: page(() => import('./routes/lab/report-row.tsx')) },
                { path: paths.lab.qcPlan.path, lazy: page(() => import('./routes/lab/qc-plan.tsx')) },
                {
                  path: paths.lab.riStudies.path,
                  lazy: page(() => import('./routes/lab/reference-intervals/studies.tsx')),
                },
                {
                  path: paths.lab.riNewStudy.path,
                  lazy: page(() => import('./routes/lab/reference-intervals/new-study.tsx')),
                },
                {
                  path: paths.lab.riStudy.path,
                  lazy: page(() => import('./routes/lab/reference-intervals/study.tsx')),
                },
                {
                  path: paths.lab.riCurrent.path,
                  lazy: page(() => import('./routes/lab/reference-intervals/current.tsx')),
                },
                {
                  path: paths.lab.riVerifications.path,
                  lazy: page(() => import('./routes/lab/reference-intervals/verifications.tsx')),
                },
                {
                  element: <RequireRole policy="labManagement" />,
                  children: [
                    {
                      path: paths.lab.procedures.path,
                      lazy: page(() => import('./routes/lab/procedures.tsx')),
                    },
                    {
                      path: paths.lab.administration.path,
                      lazy: page(() => import('./routes/lab/administration.tsx')),
                    },
                  ],
                },
              ],
            },
            {
              element: <RequireRole policy="network" />,
              children: [
                {
                  path: paths.network.overview.path,
                  lazy: page(() => import('./routes/network/overview.tsx')),
                },
                {
                  path: paths.network.catalogue.path,
                  lazy: page(() => import('./routes/network/catalogue.tsx')),
                },
                { path: paths.network.labs.path, lazy: page(() => import('./routes/network/labs.tsx')) },
                {
                  path: paths.network.procedures.path,
                  lazy: page(() => import('./routes/network/procedures.tsx')),
                },
                {
                  path: paths.network.peerGroups.path,
                  lazy: page(() => import('./routes/network/peer-groups.tsx')),
                },
                {
                  path: paths.network.lotComparisons.path,
                  lazy: page(() => import('./routes/network/lot-comparisons.tsx')),
                },
                { path: paths.network.cycles.path, lazy: page(() => import('./routes/network/cycles.tsx')) },
                {
                  path: paths.network.participation.path,
                  lazy: page(() => import('./routes/network/participation.tsx')),
                },
                {
                  path: paths.network.auditLog.path,
                  lazy: page(() => import('./routes/network/audit-log.tsx')),
                },
              ],
            },
            { path: '*', lazy: page(() => import('./routes/not-found.tsx')) },
          ],
        },
      ],
    },
  ];
}

export function AppRouter() {
  const queryClient = useQueryClient();
  const router = useMemo(() => createBrowserRouter(createAppRoutes(queryClient)), [queryClient]);
  return <RouterProvider router={router} />;
}
