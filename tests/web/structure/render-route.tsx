import type { ComponentType } from 'react';
import { QueryClientProvider } from '@tanstack/react-query';
import { render } from '@testing-library/react';
import { createMemoryRouter, Outlet, RouterProvider, useRouteError, type LoaderFunctionArgs } from 'react-router-dom';
import { vi } from 'vitest';
import type { Role } from '@shared/contracts/api';
import { queryClient } from '@/lib/query-client';
import { WorkspaceContext } from '@/lib/workspace-context';
import { settings } from './ui-fixtures';

export interface Call {
  method: string;
  url: URL;
  body: unknown;
}

/**
 * Replaces fetch with a handler keyed by "METHOD /path" and records every call (with its query
 * string and JSON body), so tests assert what the page asked the API for.
 */
export function mockApi(handler: (call: Call) => Response | Promise<Response>) {
  const calls: Call[] = [];
  const fetchMock = vi.fn(async (input: RequestInfo | URL, init?: RequestInit) => {
    const url = new URL(String(input), 'http://localhost');
    const call: Call = { method: init?.method ?? 'GET', url, body: init?.body ? JSON.parse(String(init.body)) : undefined };
    calls.push(call);
    return handler(call);
  });
  vi.stubGlobal('fetch', fetchMock);
  return calls;
}

function RouteError() {
  const error = useRouteError() as Error;
  return <p role="alert">route error: {error?.message ?? String(error)}</p>;
}

/** Renders one lazy route module (loader + Component) inside a workspace with the given role. */
export function renderRoute(
  module: { loader: (args: LoaderFunctionArgs) => Promise<unknown>; Component: ComponentType },
  { path, url, role }: { path: string; url: string; role: Role },
) {
  queryClient.clear();
  const workspace = { id: 'w-1', slug: 'demo', name: 'Demo group', defaults: settings };
  const user = { id: 'u-1', login: 'demo-user', email: 'user@example.org', name: 'Demo User' };
  const router = createMemoryRouter(
    [
      {
        path: '/w/:slug',
        element: (
          <WorkspaceContext.Provider value={{ workspace, role, user }}>
            <Outlet />
          </WorkspaceContext.Provider>
        ),
        children: [{ path, loader: module.loader, Component: module.Component, errorElement: <RouteError /> }],
      },
    ],
    { initialEntries: [url] },
  );
  const view = render(
    <QueryClientProvider client={queryClient}>
      <RouterProvider router={router} />
    </QueryClientProvider>,
  );
  return { router, ...view };
}

/** jsdom lacks ResizeObserver, which the chart library's responsive container needs. */
export function stubResizeObserver() {
  vi.stubGlobal(
    'ResizeObserver',
    class {
      observe() {}
      unobserve() {}
      disconnect() {}
    },
  );
}
