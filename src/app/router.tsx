import { createBrowserRouter, type RouteObject } from 'react-router-dom';
import { SignInPage } from '@/features/auth/components/sign-in-page';
import { PageSpinner } from '@/components/ui/spinner';
import { AppShell } from './layouts/app-shell';
import { WorkspaceLayout } from './layouts/workspace-layout';
import { homeLoader, requireMeLoader, workspaceLoader } from './loaders';
import { NoWorkspacePage } from './pages/no-workspace-page';
import { NotFoundPage } from './pages/not-found-page';
import { RouteError } from './pages/route-error';

/**
 * The route table. Pages are lazy route modules (`loader` + `Component`, React Router's `lazy`
 * convention) so each page's code — and the charts and 3D of the batch and structure pages —
 * loads only when visited. Loaders warm the TanStack cache; components read it with
 * useSuspenseQuery.
 */
export const routes: RouteObject[] = [
  { path: '/sign-in', Component: SignInPage },
  { path: '/invite/:token', lazy: () => import('@/features/workspaces/invite-route'), errorElement: <RouteError />, HydrateFallback: PageSpinner },
  {
    path: '/',
    id: 'root',
    loader: requireMeLoader,
    Component: AppShell,
    errorElement: <RouteError />,
    HydrateFallback: PageSpinner,
    children: [
      {
        errorElement: <RouteError />,
        children: [
          { index: true, loader: homeLoader, Component: NoWorkspacePage },
          {
            path: 'w/:slug',
            loader: workspaceLoader,
            Component: WorkspaceLayout,
            children: [
              { index: true, lazy: () => import('@/features/batches/route') },
              { path: 'new', lazy: () => import('@/features/new-batch/route') },
              { path: 'batches/:batchId', lazy: () => import('@/features/batch/route') },
              { path: 'structures/:structureId', lazy: () => import('@/features/structure/route') },
              { path: 'settings', lazy: () => import('@/features/settings/route') },
              { path: '*', Component: NotFoundPage },
            ],
          },
          { path: '*', Component: NotFoundPage },
        ],
      },
    ],
  },
];

export function createRouter() {
  return createBrowserRouter(routes);
}
