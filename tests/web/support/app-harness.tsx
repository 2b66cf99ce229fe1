import { configure, render } from '@testing-library/react';
import { RouterProvider, createMemoryRouter } from 'react-router-dom';
import { vi } from 'vitest';
import { Providers } from '@/app/providers';
import { routes } from '@/app/router';
import { queryClient } from '@/lib/query-client';

// Lazy route modules are compiled on first use in a test run; give the first render time.
configure({ asyncUtilTimeout: 5000 });

/** One request the app made, as the stub saw it. */
export interface SeenRequest {
  method: string;
  url: URL;
}

/**
 * Replaces fetch with a router of canned answers (UI fixture data): `answer` returns a Response
 * or undefined; undefined answers 404 with the API's error body.
 */
export function stubApi(answer: (req: SeenRequest) => Response | undefined) {
  const seen: SeenRequest[] = [];
  const fetchMock = vi.fn(async (input: RequestInfo | URL, init?: RequestInit) => {
    const url = new URL(String(input), 'http://pointfold.test');
    const req = { method: init?.method ?? 'GET', url };
    seen.push(req);
    return answer(req) ?? json({ error: { code: 'not-found', message: 'Not found' } }, 404);
  });
  vi.stubGlobal('fetch', fetchMock);
  return { seen, fetchMock };
}

export function json(body: unknown, status = 200): Response {
  return new Response(JSON.stringify(body), { status, headers: { 'Content-Type': 'application/json' } });
}

/** Renders the real route table at `url` with a fresh cache. */
export function renderApp(url: string) {
  queryClient.clear();
  const router = createMemoryRouter(routes, { initialEntries: [url] });
  const view = render(
    <Providers client={queryClient}>
      <RouterProvider router={router} />
    </Providers>,
  );
  return { router, ...view };
}

/** UI fixture data: an invented person and workspaces. */
export const demoWorkspace = {
  id: 'w-1',
  slug: 'demo',
  name: 'Demo group',
  defaults: { tolerance: 0.01, target: { kind: 'perceived' }, frame: 'standard', displacementBudget: 0.05, charge: 0, multiplicity: null, outputFormats: ['xyz', 'qcschema'] },
};

export function meFixture(role: 'owner' | 'chemist' | 'reviewer' | null) {
  return {
    user: { id: 'u-1', login: 'demo-person', email: 'person@example.org', name: 'Demo Person' },
    memberships: role ? [{ workspace: demoWorkspace, role }] : [],
  };
}
